package dev.winnow.api;

import io.javalin.http.Context;
import io.javalin.router.Endpoint;
import io.micrometer.core.instrument.MeterRegistry;
import io.micrometer.core.instrument.Timer;

import java.time.Duration;
import java.util.concurrent.TimeUnit;
import java.util.function.Supplier;

/**
 * {@code GET /metrics} in the Prometheus text exposition format, and the timing of every HTTP request into the
 * same registry: {@code http_server_requests_seconds} by route template (never the raw path, so the number of series
 * stays bounded; {@code unmatched} for paths no route knows), method and status, as a histogram.
 */
final class MetricsEndpoint {
    /** Histogram bucket bounds for request latency. */
    private static final Duration[] BUCKETS = {
            Duration.ofMillis(1), Duration.ofMillis(2), Duration.ofMillis(5), Duration.ofMillis(10), Duration.ofMillis(25),
            Duration.ofMillis(50), Duration.ofMillis(100), Duration.ofMillis(250), Duration.ofMillis(500),
            Duration.ofSeconds(1), Duration.ofMillis(2500), Duration.ofSeconds(5), Duration.ofSeconds(10), Duration.ofSeconds(30)};
    static final String CONTENT_TYPE = "text/plain; version=0.0.4; charset=utf-8";

    private final MeterRegistry registry;
    private final Supplier<String> scrape;

    MetricsEndpoint(MeterRegistry registry, Supplier<String> scrape) {
        this.registry = registry;
        this.scrape = scrape;
    }

    /** Request logger: called once per request after its answer, errors included, with the time it took. */
    void record(Context ctx, Float millis) {
        Endpoint endpoint = ctx.endpoints().lastHttpEndpoint();
        String route = endpoint == null ? "unmatched" : endpoint.path;
        Timer.builder("http.server.requests")
                .description("HTTP requests by route template, method and status")
                .tag("route", route).tag("method", ctx.method().name()).tag("status", String.valueOf(ctx.statusCode()))
                .serviceLevelObjectives(BUCKETS)
                .register(registry)
                .record((long) (millis * 1_000_000L), TimeUnit.NANOSECONDS);
    }

    /** The encoded-response cache's hits and misses, beside the series cache's. */
    void watch(ServedResponses served) {
        io.micrometer.core.instrument.FunctionCounter.builder("winnow.cache.requests", served, ServedResponses::hits)
                .tag("cache", "responses").tag("result", "hit").description("Cache lookups").register(registry);
        io.micrometer.core.instrument.FunctionCounter.builder("winnow.cache.requests", served, ServedResponses::misses)
                .tag("cache", "responses").tag("result", "miss").description("Cache lookups").register(registry);
    }

    void scrape(Context ctx) {
        ctx.contentType(CONTENT_TYPE).result(scrape.get());
    }
}
