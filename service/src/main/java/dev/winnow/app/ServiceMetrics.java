package dev.winnow.app;

import dev.winnow.store.JobKind;
import dev.winnow.jobs.JobOutcome;
import dev.winnow.jobs.JobWorker;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import io.micrometer.core.instrument.Counter;
import io.micrometer.core.instrument.FunctionCounter;
import io.micrometer.core.instrument.Gauge;
import io.micrometer.core.instrument.Timer;
import io.micrometer.core.instrument.binder.jvm.ClassLoaderMetrics;
import io.micrometer.core.instrument.binder.jvm.JvmGcMetrics;
import io.micrometer.core.instrument.binder.jvm.JvmMemoryMetrics;
import io.micrometer.core.instrument.binder.jvm.JvmThreadMetrics;
import io.micrometer.core.instrument.binder.system.ProcessorMetrics;
import io.micrometer.core.instrument.binder.system.UptimeMetrics;
import io.micrometer.prometheusmetrics.PrometheusConfig;
import io.micrometer.prometheusmetrics.PrometheusMeterRegistry;

import java.time.Duration;
import java.util.concurrent.TimeUnit;

/**
 * The instance's metrics, for {@code GET /metrics} in the Prometheus text format: one Micrometer registry with the
 * JVM's memory, GC, threads and CPU, the connection pool (HikariCP reports into it), jobs by kind and final state
 * with their durations, rows ingested, the job queue's depth and the series cache's hits and misses. HTTP requests
 * are timed by the API server into the same registry.
 */
public final class ServiceMetrics implements AutoCloseable {
    private final PrometheusMeterRegistry registry = new PrometheusMeterRegistry(PrometheusConfig.DEFAULT);
    private final JvmGcMetrics gc = new JvmGcMetrics();

    public ServiceMetrics() {
        new JvmMemoryMetrics().bindTo(registry);
        gc.bindTo(registry);
        new JvmThreadMetrics().bindTo(registry);
        new ClassLoaderMetrics().bindTo(registry);
        new ProcessorMetrics().bindTo(registry);
        new UptimeMetrics().bindTo(registry);
    }

    public PrometheusMeterRegistry registry() {
        return registry;
    }

    /** The queue's depth (queued and running jobs in the shared store), read at each scrape. */
    public void watchQueue(JobStore jobs) {
        Gauge.builder("winnow.jobs.queued", jobs, j -> safely(() -> j.queueCounts().queued()))
                .description("Jobs waiting in the store's queue (all instances)").register(registry);
        Gauge.builder("winnow.jobs.running", jobs, j -> safely(() -> j.queueCounts().running()))
                .description("Jobs running on any instance").register(registry);
    }

    /** The series cache of this instance. */
    public void watchSeriesCache(FactorStore factors) {
        FunctionCounter.builder("winnow.cache.requests", factors, f -> f.seriesCacheHits()).tag("cache", "series")
                .tag("result", "hit").description("Series cache lookups").register(registry);
        FunctionCounter.builder("winnow.cache.requests", factors, f -> f.seriesCacheMisses()).tag("cache", "series")
                .tag("result", "miss").description("Series cache lookups").register(registry);
    }

    private static double safely(java.util.function.LongSupplier read) {
        try {
            return read.getAsLong();
        } catch (RuntimeException e) {
            return Double.NaN; // the store does not answer: the gauge says so instead of failing the scrape
        }
    }

    /** Records each job this instance finished: its duration by kind and state, and the rows an upload took in. */
    public JobWorker.JobObserver jobObserver() {
        return (JobRecord job, JobOutcome outcome, long nanos) -> {
            String state = outcome.succeeded() ? "succeeded" : "failed";
            Timer.builder("winnow.jobs").tag("kind", job.kind().wireName()).tag("state", state)
                    .description("Jobs finished by this instance, by kind and final state")
                    .publishPercentileHistogram().minimumExpectedValue(Duration.ofMillis(1)).maximumExpectedValue(Duration.ofHours(2))
                    .register(registry).record(nanos, TimeUnit.NANOSECONDS);
            if (outcome.succeeded() && (job.kind() == JobKind.PANEL_UPLOAD || job.kind() == JobKind.SERIES_UPLOAD)) {
                Counter.builder("winnow.rows.ingested").tag("kind", job.kind().wireName()).description("Rows accepted by uploads")
                        .register(registry).increment(outcome.counters().rowsAccepted());
            }
        };
    }

    /** The scrape: every meter in the Prometheus text exposition format. */
    public String scrape() {
        return registry.scrape();
    }

    @Override
    public void close() {
        gc.close();
        registry.close();
    }
}
