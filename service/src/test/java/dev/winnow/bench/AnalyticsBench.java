package dev.winnow.bench;

import dev.winnow.stats.Correlations;
import dev.winnow.stats.CorrelationMatrix;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.RollingCorrelation;
import dev.winnow.stats.RollingSignificance;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.function.Supplier;

/**
 * Hand-run timing of the analytics hot paths (not a unit test; the name keeps surefire away):
 * 50 seeded daily series of 6,300 weekday observations; median wall time over 20 repetitions after warm-up
 * (at least 50 calls and 3 seconds per task).
 * Run after {@code mvn test-compile} with the service's classes, test classes and commons-math3 on the class path:
 * {@code java -cp target/classes:target/test-classes:<commons-math3.jar> dev.winnow.bench.AnalyticsBench}
 */
public final class AnalyticsBench {

    private static final int SERIES = 50;
    private static final int POINTS = 6_300;
    private static final int WINDOW = 252;
    private static final int WARM_UP_CALLS = 50;
    private static final long WARM_UP_NANOS = 3_000_000_000L;
    private static final int REPETITIONS = 20;

    private AnalyticsBench() {
    }

    public static void main(String[] args) {
        List<ReturnSeries> series = generate(new Random(20240601L));
        ReturnSeries first = series.get(0);
        ReturnSeries second = series.get(1);
        report("50x50 Pearson matrix", () -> Correlations.matrix(series, Correlations.Method.PEARSON));
        report("50x50 Spearman matrix", () -> Correlations.matrix(series, Correlations.Method.SPEARMAN));
        report("50x50 Pearson matrix, every series missing ~2% of dates", matrixWithGaps(series));
        report("rolling Pearson, window 252", () -> Correlations.rolling(first, second, WINDOW, Correlations.Method.PEARSON));
        report("rolling significance, window 252, auto lags", () -> RollingSignificance.compute(first, WINDOW, 252, null));
    }

    private static Supplier<CorrelationMatrix> matrixWithGaps(List<ReturnSeries> series) {
        Random random = new Random(7L);
        List<ReturnSeries> gapped = new ArrayList<>();
        for (ReturnSeries s : series) {
            List<LocalDate> dates = new ArrayList<>();
            List<Double> values = new ArrayList<>();
            for (int t = 0; t < s.size(); t++) {
                if (random.nextDouble() >= 0.02) {
                    dates.add(s.date(t));
                    values.add(s.value(t));
                }
            }
            gapped.add(new ReturnSeries(dates.toArray(new LocalDate[0]), values.stream().mapToDouble(Double::doubleValue).toArray()));
        }
        return () -> Correlations.matrix(gapped, Correlations.Method.PEARSON);
    }

    private static List<ReturnSeries> generate(Random random) {
        LocalDate[] dates = new LocalDate[POINTS];
        LocalDate d = LocalDate.of(2000, 1, 3);
        for (int t = 0; t < POINTS; t++) {
            while (d.getDayOfWeek() == DayOfWeek.SATURDAY || d.getDayOfWeek() == DayOfWeek.SUNDAY) {
                d = d.plusDays(1);
            }
            dates[t] = d;
            d = d.plusDays(1);
        }
        double[] market = new double[POINTS];
        for (int t = 0; t < POINTS; t++) {
            market[t] = random.nextGaussian() * 0.01;
        }
        List<ReturnSeries> series = new ArrayList<>();
        for (int i = 0; i < SERIES; i++) {
            double beta = random.nextDouble() * 1.5 - 0.5;
            double[] values = new double[POINTS];
            for (int t = 0; t < POINTS; t++) {
                values[t] = 0.0002 + beta * market[t] + random.nextGaussian() * 0.008;
            }
            series.add(new ReturnSeries(dates, values));
        }
        return series;
    }

    private static void report(String label, Supplier<?> task) {
        // warm up until the JIT has settled: at least 50 calls and 3 s (the compiler threads share the cores)
        Object sink = null;
        long warmUpStart = System.nanoTime();
        for (int i = 0; i < WARM_UP_CALLS || System.nanoTime() - warmUpStart < WARM_UP_NANOS; i++) {
            sink = task.get();
        }
        double[] millis = new double[REPETITIONS];
        for (int i = 0; i < REPETITIONS; i++) {
            long start = System.nanoTime();
            sink = task.get();
            millis[i] = (System.nanoTime() - start) / 1e6;
        }
        Arrays.sort(millis);
        double median = (millis[REPETITIONS / 2 - 1] + millis[REPETITIONS / 2]) / 2.0;
        System.out.printf("%-58s median %8.2f ms  (min %.2f, max %.2f)%s%n", label, median, millis[0],
                millis[REPETITIONS - 1], sink == null ? " no result" : "");
    }
}
