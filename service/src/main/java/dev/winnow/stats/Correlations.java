package dev.winnow.stats;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;

/**
 * Pearson and Spearman correlations of return series on pairwise complete observations (the dates both series have).
 * Fewer than {@value #MIN_OBSERVATIONS} common observations, or no variation in either series, give NaN.
 */
public final class Correlations {

    /** Smallest number of common observations for which a correlation is reported. */
    public static final int MIN_OBSERVATIONS = 3;

    /** Which correlation coefficient. */
    public enum Method {
        /** Product-moment correlation (Pearson 1896). */
        PEARSON,
        /** Pearson correlation of average ranks, ties sharing the mean rank (Spearman 1904). */
        SPEARMAN
    }

    private Correlations() {
    }

    /**
     * Pearson (1896) product-moment correlation
     * r = sum (x - mean x)(y - mean y) / sqrt(sum (x - mean x)^2 sum (y - mean y)^2),
     * computed from deviations from the means (a second pass after the means, see {@link ShiftedSums}).
     */
    public static double pearson(double[] x, double[] y) {
        checkPairedArrays(x, y);
        return pearson(x, y, x.length);
    }

    /**
     * Spearman (1904) rank correlation: the Pearson correlation of the 1-based ranks, tied values all receiving the
     * average of the ranks they span.
     */
    public static double spearman(double[] x, double[] y) {
        checkPairedArrays(x, y);
        return spearman(x, y, x.length);
    }

    /** 1-based ranks of x, ties receiving the average of the ranks they span (e.g. 10, 20, 20, 30 -> 1, 2.5, 2.5, 4). */
    public static double[] averageRanks(double[] x) {
        AnalyticsChecks.finiteValues(x, "x");
        return Ranks.averageRanks(x, x.length);
    }

    /** Correlation of two series over the dates both have. */
    public static double correlation(ReturnSeries a, ReturnSeries b, Method method) {
        AnalyticsChecks.notNull(a, "a");
        AnalyticsChecks.notNull(b, "b");
        AnalyticsChecks.notNull(method, "method");
        DateAlignment.Common common = DateAlignment.common(a, b);
        return of(method, common.x(), common.y(), common.size());
    }

    /**
     * Correlation matrix of several series, each pair over the dates both have. The diagonal is 1.0 with the
     * series' own count, or NaN when the series itself has fewer than {@value #MIN_OBSERVATIONS} observations or
     * no variation. Dates are aligned once by merging; each pair then costs one pass over the union of dates.
     */
    public static CorrelationMatrix matrix(List<ReturnSeries> series, Method method) {
        AnalyticsChecks.notNull(series, "series");
        AnalyticsChecks.notNull(method, "method");
        for (int i = 0; i < series.size(); i++) {
            AnalyticsChecks.notNull(series.get(i), "series[" + i + "]");
        }
        return new PairwiseMatrix(series, method).compute();
    }

    /**
     * Correlation over rolling windows of the last {@code window} common observations, one value per common date from
     * the window-th on. Pearson runs in O(n) with running sums (see {@link RollingPearson}); Spearman re-ranks each
     * window, O(n w log w). Empty when the series share fewer than {@code window} dates.
     */
    public static RollingCorrelation rolling(ReturnSeries a, ReturnSeries b, int window, Method method) {
        AnalyticsChecks.notNull(a, "a");
        AnalyticsChecks.notNull(b, "b");
        AnalyticsChecks.atLeast(window, MIN_OBSERVATIONS, "window");
        AnalyticsChecks.notNull(method, "method");
        DateAlignment.Common common = DateAlignment.common(a, b);
        int m = common.size();
        if (m < window) {
            return new RollingCorrelation(new LocalDate[0], new double[0]);
        }
        double[] values = method == Method.PEARSON
                ? RollingPearson.compute(common.x(), common.y(), window)
                : rollingSpearman(common.x(), common.y(), window);
        return new RollingCorrelation(Arrays.copyOfRange(common.dates(), window - 1, m), values);
    }

    static double of(Method method, double[] x, double[] y, int n) {
        return method == Method.PEARSON ? pearson(x, y, n) : spearman(x, y, n);
    }

    /** Pearson correlation of x[0..n) and y[0..n): sums of deviations from the means ({@link ShiftedSums}). */
    static double pearson(double[] x, double[] y, int n) {
        if (n < MIN_OBSERVATIONS) {
            return Double.NaN;
        }
        return ShiftedSums.over(x, WindowMoments.mean(x, 0, n), y, WindowMoments.mean(y, 0, n), n).correlation();
    }

    static double spearman(double[] x, double[] y, int n) {
        if (n < MIN_OBSERVATIONS) {
            return Double.NaN;
        }
        return pearson(Ranks.averageRanks(x, n), Ranks.averageRanks(y, n), n);
    }

    private static double[] rollingSpearman(double[] x, double[] y, int window) {
        double[] out = new double[x.length - window + 1];
        double[] windowX = new double[window];
        double[] windowY = new double[window];
        for (int start = 0; start < out.length; start++) {
            System.arraycopy(x, start, windowX, 0, window);
            System.arraycopy(y, start, windowY, 0, window);
            out[start] = spearman(windowX, windowY, window);
        }
        return out;
    }

    private static void checkPairedArrays(double[] x, double[] y) {
        AnalyticsChecks.finiteValues(x, "x");
        AnalyticsChecks.finiteValues(y, "y");
        if (x.length != y.length) {
            throw new IllegalArgumentException("x and y must pair up: lengths " + x.length + " and " + y.length);
        }
    }
}
