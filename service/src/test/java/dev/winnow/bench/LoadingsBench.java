package dev.winnow.bench;

import dev.winnow.api.LoadingsRoutes;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.FactorGrid;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.LoadingsTestPanel;
import dev.winnow.construct.PanelSource;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.research.LoadingsService;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsTestStore;
import io.javalin.Javalin;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.function.Supplier;

/**
 * Loadings benchmark (a main, not a test): 3,000 securities x 10 factors x window 252 on a generated daily panel.
 * Times one new date computed in memory and from an H2 store (the upload hook's work), the history job's cost per
 * date, and stored loadings read from the store and over HTTP (JSON and CSV).
 *
 * <p>Run from the service module after {@code mvn -o -q test-compile}:
 * {@code java -cp target/classes:target/test-classes:$(cat cp.txt) dev.winnow.bench.LoadingsBench}
 * with cp.txt from {@code mvn -o -q dependency:build-classpath -Dmdep.outputFile=cp.txt}.
 */
public final class LoadingsBench {
    private static final int SECURITIES = 3_000;
    private static final int FACTORS = 10;
    private static final int WINDOW = 252;
    private static final int DATES = 300;
    private static final String PANEL = "bench-equities";

    private LoadingsBench() {
    }

    public static void main(String[] args) throws Exception {
        List<LocalDate> dates = LoadingsTestStore.weekdays(LocalDate.of(2023, 1, 2), DATES);
        double[][] f = LoadingsTestStore.factorReturns(1, FACTORS, DATES);
        List<CrossSection> slices = LoadingsTestStore.slices(2, SECURITIES, dates, f, 0, DATES - 1);
        List<ReturnSeries> series = new ArrayList<>();
        for (double[] row : f) {
            series.add(new ReturnSeries(dates.toArray(new LocalDate[0]), row));
        }
        PanelSource memory = LoadingsTestPanel.of(dates, slices);
        int last = DATES - 1;
        FactorGrid grid = FactorGrid.align(series, dates);
        report("one new date, in memory (3,000 x 10 x 252)", 5, () -> SecurityLoadings.at(memory, grid, last, WINDOW, WINDOW / 2));
        report("history job per date, in memory (slide over 40 dates)", 2, () -> {
            int[] count = {0};
            SecurityLoadings.slide(memory, grid, last - 39, last, WINDOW, WINDOW / 2, t -> count[0]++);
            return count[0];
        }, 40);

        try (LoadingsTestStore store = new LoadingsTestStore()) {
            long t0 = System.nanoTime();
            long panelId = store.upload(PANEL, SECURITIES, slices.subList(0, last), true);
            List<String> names = new ArrayList<>();
            for (int j = 0; j < FACTORS; j++) {
                names.add(store.factor("bench-f" + j, dates, LoadingsTestStore.prefix(f[j], last)));
            }
            System.out.printf("setup: %d dates x %d securities and %d factors stored in %.1f s%n", last, SECURITIES, FACTORS,
                    (System.nanoTime() - t0) / 1e9);
            LoadingsSpec spec = new LoadingsSpec(names, WINDOW, WINDOW / 2);
            store.loadings.saveConfig(panelId, spec);
            LoadingsRefresh refresh = new LoadingsRefresh(store.panels, store.factors, store.loadings);

            store.upload(PANEL, SECURITIES, slices.subList(last, DATES), false);
            for (int j = 0; j < FACTORS; j++) {
                store.extendFactor(names.get(j), dates, f[j], last, null);
            }
            report("one new date, from the H2 store, on the fly (reads 252 slices)", 3, () -> SecurityLoadings.at(
                    store.panels.source(panelId), series, last, WINDOW, WINDOW / 2));
            report("upload hook for one appended date (read, compute, store)", 3,
                    () -> refresh.afterUpload(panelId, List.of(dates.get(last)), false));

            String fingerprint = LoadingsStore.fingerprint(spec, LoadingsFactors.currentVersions(store.factors, names));
            report("stored loadings read + decoded from H2", 20,
                    () -> store.loadings.read(panelId, dates.get(last), fingerprint).orElseThrow());

            LoadingsRoutes routes = new LoadingsRoutes(store.panels,
                    new LoadingsService(store.panels, store.factors, store.loadings, new JobQueue(store.jobs)));
            Javalin server = Javalin.create(config -> {
                config.startup.showJavalinBanner = false;
                config.jetty.host = "127.0.0.1";
                config.jetty.port = 0;
                config.routes.get("/v1/loadings", routes::get);
            }).start();
            try {
                HttpClient client = HttpClient.newHttpClient();
                URI uri = URI.create("http://127.0.0.1:" + server.port() + "/v1/loadings?panel=" + PANEL);
                report("stored loadings over HTTP, JSON (config factors)", 20, () -> fetch(client, uri, "application/json"));
                report("stored loadings over HTTP, CSV", 20, () -> fetch(client, uri, "text/csv"));
            } finally {
                server.stop();
            }
            dev.winnow.research.LoadingsHistory job = new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });
            System.out.println("(history job check: " + job.computedDates() + " dates stored)");
        }
    }

    private static String fetch(HttpClient client, URI uri, String accept) {
        try {
            HttpResponse<String> r = client.send(HttpRequest.newBuilder(uri).header("Accept", accept).GET().build(),
                    HttpResponse.BodyHandlers.ofString());
            if (r.statusCode() != 200 || !"stored".equals(r.headers().firstValue("Winnow-Loadings-Source").orElse(""))) {
                throw new IllegalStateException("expected a stored answer, got " + r.statusCode() + ": " + r.body());
            }
            return r.body();
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
    }

    private static void report(String what, int runs, Supplier<Object> work) {
        report(what, runs, work, 1);
    }

    /** Two warm-up runs, then {@code runs} timed runs; prints the median and the best, divided by {@code perRun}. */
    private static void report(String what, int runs, Supplier<Object> work, int perRun) {
        for (int i = 0; i < 2; i++) {
            sink(work.get());
        }
        double[] ms = new double[runs];
        for (int i = 0; i < runs; i++) {
            long start = System.nanoTime();
            sink(work.get());
            ms[i] = (System.nanoTime() - start) / 1e6 / perRun;
        }
        Arrays.sort(ms);
        System.out.printf("%-66s median %8.1f ms   best %8.1f ms%n", what, ms[runs / 2], ms[0]);
    }

    private static int sinkHash;

    private static void sink(Object o) {
        sinkHash += o instanceof LoadingsTable t ? t.size() : o.hashCode();
    }
}
