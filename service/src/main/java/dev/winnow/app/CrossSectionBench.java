package dev.winnow.app;

import dev.winnow.construct.CrossSection;
import dev.winnow.stats.LinearRegression;
import dev.winnow.store.PanelReadAhead;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorePanelSource;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.jdbi.v3.core.Jdbi;

import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.temporal.TemporalAdjusters;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * The cross-sectional figures of the {@code bench} command, each beside a peer measured in the same run (the machine
 * is shared, so ratios travel better than seconds):
 * <ul>
 *   <li>information coefficients at 5 horizons and Fama-MacBeth with 3 signals over HTTP on the benchmark panel
 *   (targets under 2 s each), beside the time to read every cross-section of the panel once in process through
 *   {@link StorePanelSource}, the read both studies start from;</li>
 *   <li>a test of a 5-factor model on 25 test assets over 300 months over HTTP (target under 50 ms), beside the 30x30
 *   correlation matrix of the same 30 series over HTTP (the same series read, simpler math);</li>
 *   <li>3,000 time-series regressions on 10 regressors over 252 dates through {@link LinearRegression.Design} (the
 *   loadings' path; a tenth of the responses miss 20 dates and take the refit path), beside the same fits by
 *   Apache Commons Math's {@link OLSMultipleLinearRegression}.</li>
 * </ul>
 */
final class CrossSectionBench {
    private final BenchClient http;
    private final Jdbi jdbi;

    CrossSectionBench(BenchClient http, Jdbi jdbi) {
        this.http = http;
        this.jdbi = jdbi;
    }

    /** Runs every figure; {@code panel} is a panel name and {@code factor} a sort factor on it with a column signal. */
    void run(String panel, String factor) throws Exception {
        Timing before = readPanel(panel);
        Timing ic = time(4, 5, () -> get("/v1/factors/" + factor + "/ic?horizons=1,2,3,6,12"));
        String body = "{\"panel\":\"" + panel + "\",\"signals\":{\"value\":\"book_to_price\",\"momentum\":\"momentum_12_1\","
                + "\"profitability\":\"gross_profitability\"},\"standardize\":true}";
        Timing fm = time(4, 5, () -> post("/v1/fama-macbeth", body));
        Timing after = readPanel(panel);
        // the peer is read before and after the studies, so that a change in the machine's load shows
        Timing read = before.wall() <= after.wall() ? before : after;
        System.out.printf(Locale.ROOT, "peer: read every cross-section of panel %s once in process (one thread): %s before the studies,"
                + " %s after%n", panel, before, after);
        System.out.printf(Locale.ROOT, "information coefficients of %s, horizons 1,2,3,6,12, over HTTP: %s = %.2f x the faster panel read's"
                + " wall time (target under 2,000 ms)%n", factor, ic, ic.wall() / read.wall());
        System.out.printf(Locale.ROOT, "Fama-MacBeth, 3 signals standardised, every period, over HTTP: %s = %.2f x the faster panel read's"
                + " wall time (target under 2,000 ms)%n", fm, fm.wall() / read.wall());
        modelTest();
        regressions();
    }

    /** Reads every cross-section of the panel once, in grid order, as the studies do; the median of three reads. */
    private Timing readPanel(String name) throws Exception {
        try (PanelReadAhead readAhead = PanelReadAhead.perProcessor()) {
            PanelStore panels = new PanelStore(jdbi, readAhead);
            long id = panels.find(name).orElseThrow().id();
            return time(1, 3, () -> {
                StorePanelSource source = panels.source(id);
                long rows = 0;
                for (int t = 0; t < source.dates().size(); t++) {
                    CrossSection cs = source.crossSection(t);
                    rows += cs.size();
                }
                if (rows == 0) {
                    throw new IllegalStateException("empty panel " + name);
                }
            });
        }
    }

    /**
     * 5 factors and 25 test assets of 300 monthly returns (each asset loads on the factors plus noise), uploaded as
     * external series; then the model test over HTTP against the 30x30 correlation matrix of the same series.
     */
    private void modelTest() throws Exception {
        int months = 300;
        SplittableRandom random = new SplittableRandom(25);
        List<LocalDate> dates = new ArrayList<>();
        LocalDate d = LocalDate.of(2000, 1, 31);
        for (int t = 0; t < months; t++) {
            dates.add(d);
            d = d.plusMonths(1).with(TemporalAdjusters.lastDayOfMonth());
        }
        double[][] f = new double[5][months];
        List<String> factorNames = new ArrayList<>();
        for (int j = 0; j < 5; j++) {
            for (int t = 0; t < months; t++) {
                f[j][t] = 0.004 + 0.03 * gaussian(random);
            }
            factorNames.add("mt_f" + j);
            uploadMonthly("mt_f" + j, dates, f[j]);
        }
        List<String> assetNames = new ArrayList<>();
        for (int a = 0; a < 25; a++) {
            double[] r = new double[months];
            for (int t = 0; t < months; t++) {
                r[t] = 0.001 * (a % 5) + 0.04 * gaussian(random);
                for (int j = 0; j < 5; j++) {
                    r[t] += (0.2 + 0.1 * ((a + j) % 7)) * f[j][t];
                }
            }
            assetNames.add("mt_a" + a);
            uploadMonthly("mt_a" + a, dates, r);
        }
        String test = "/v1/model-tests?factors=" + String.join(",", factorNames) + "&assets=" + String.join(",", assetNames);
        Timing model = time(5, 20, () -> get(test));
        List<String> all = new ArrayList<>(factorNames);
        all.addAll(assetNames);
        Timing matrix = time(5, 20, () -> get("/v1/correlations?factors=" + String.join(",", all)));
        System.out.printf(Locale.ROOT, "model test, 25 assets on 5 factors over 300 months (GRS, per-asset OLS and NW t), over HTTP:"
                + " %s = %.2f x the 30x30 correlation matrix of the same series (%s) (target under 50 ms)%n",
                model, model.wall() / matrix.wall(), matrix);
    }

    private void uploadMonthly(String name, List<LocalDate> dates, double[] returns) throws Exception {
        HttpResponse<String> put = http.putJson("/v1/factors/" + name, "{\"method\":\"external\"}");
        if (put.statusCode() / 100 != 2) {
            throw new IllegalStateException("defining " + name + " answered " + put.statusCode() + ": " + put.body());
        }
        StringBuilder csv = new StringBuilder("date,return\n");
        for (int t = 0; t < returns.length; t++) {
            csv.append(dates.get(t)).append(',').append(String.format(Locale.ROOT, "%.8f", returns[t])).append('\n');
        }
        Path file = Files.createTempFile("series", ".csv");
        try {
            Files.writeString(file, csv);
            http.awaitJob(http.upload("/v1/factors/" + name + "/uploads", file));
        } finally {
            Files.delete(file);
        }
    }

    /**
     * 3,000 regressions of 252 dates on 10 regressors, a tenth of the responses missing their first 20 dates: through
     * {@link LinearRegression.Design} and through Commons Math (which refits each response from scratch).
     */
    static void regressions() throws Exception {
        SplittableRandom random = new SplittableRandom(5);
        int dates = 252;
        int k = 10;
        double[][] x = new double[k][dates];
        for (double[] column : x) {
            for (int t = 0; t < dates; t++) {
                column[t] = 0.01 * gaussian(random);
            }
        }
        List<double[]> ys = new ArrayList<>();
        for (int s = 0; s < 3000; s++) {
            double[] y = new double[dates];
            for (int t = 0; t < dates; t++) {
                y[t] = s % 10 == 0 && t < 20 ? Double.NaN : 0.5 * x[s % k][t] + 0.02 * gaussian(random);
            }
            ys.add(y);
        }
        double[] sink = new double[1];
        Timing design = time(2, 7, () -> {
            LinearRegression.Design fit = LinearRegression.design(x);
            for (double[] y : ys) {
                sink[0] += fit.fit(y).beta(0);
            }
        });
        Timing reference = time(2, 7, () -> {
            for (double[] y : ys) {
                int n = 0;
                for (double v : y) {
                    n += Double.isNaN(v) ? 0 : 1;
                }
                double[] yy = new double[n];
                double[][] xx = new double[n][k];
                int row = 0;
                for (int t = 0; t < dates; t++) {
                    if (!Double.isNaN(y[t])) {
                        yy[row] = y[t];
                        for (int j = 0; j < k; j++) {
                            xx[row][j] = x[j][t];
                        }
                        row++;
                    }
                }
                OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
                ols.newSampleData(yy, xx);
                sink[0] += ols.estimateRegressionParameters()[1];
            }
        });
        if (!Double.isFinite(sink[0])) {
            throw new IllegalStateException("regressions gave " + sink[0]);
        }
        System.out.printf(Locale.ROOT, "3,000 regressions, 252 dates x 10 regressors (a tenth refit for missing dates), in process:"
                + " LinearRegression.Design %s = %.2f x Commons Math OLSMultipleLinearRegression (%s)%n",
                design, design.wall() / reference.wall(), reference);
    }

    private void get(String path) throws Exception {
        check(path, http.get(path));
    }

    private void post(String path, String body) throws Exception {
        check(path, http.postJson(path, body));
    }

    private static void check(String path, HttpResponse<String> response) {
        if (response.statusCode() != 200) {
            throw new IllegalStateException(path + " answered " + response.statusCode() + ": " + response.body());
        }
    }

    interface Timed {
        void run() throws Exception;
    }

    /**
     * Medians of a figure's runs: wall milliseconds, and milliseconds of CPU used by the whole process meanwhile (every
     * thread: the server's, the study threads', the client's), which the machine's load changes far less.
     */
    /** @param first the wall time of the first (warm-up) run, as a fresh process answers it; NaN without warm-ups */
    record Timing(double first, double wall, double cpu) {
        @Override
        public String toString() {
            return String.format(Locale.ROOT, "median %.1f ms wall, %.1f ms process CPU", wall, cpu)
                    + (Double.isNaN(first) ? "" : String.format(Locale.ROOT, " (first run %.0f ms)", first));
        }
    }

    /** The medians of {@code runs} runs after {@code warmups} untimed ones (the JIT compiles the hot code meanwhile). */
    static Timing time(int warmups, int runs, Timed what) throws Exception {
        double first = Double.NaN;
        for (int i = 0; i < warmups; i++) {
            long t0 = System.nanoTime();
            what.run();
            first = i == 0 ? (System.nanoTime() - t0) / 1e6 : first;
        }
        var os = (com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        double[] wall = new double[runs];
        double[] cpu = new double[runs];
        for (int i = 0; i < runs; i++) {
            long c0 = os.getProcessCpuTime();
            long t0 = System.nanoTime();
            what.run();
            wall[i] = (System.nanoTime() - t0) / 1e6;
            cpu[i] = (os.getProcessCpuTime() - c0) / 1e6;
        }
        return new Timing(first, median(wall), median(cpu));
    }

    private static double median(double[] values) {
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        int n = sorted.length;
        return n % 2 == 1 ? sorted[n / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
    }

    /** A standard normal draw (Box-Muller), so that the figures' inputs are the same on every JVM. */
    private static double gaussian(SplittableRandom random) {
        return StrictMath.sqrt(-2 * StrictMath.log(1 - random.nextDouble())) * StrictMath.cos(2 * StrictMath.PI * random.nextDouble());
    }
}
