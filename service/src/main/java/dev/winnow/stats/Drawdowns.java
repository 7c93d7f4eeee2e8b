package dev.winnow.stats;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Drawdowns of the wealth index W_t = prod_{s<=t} (1 + r_s), starting from W_0 = 1 before the first return:
 * underwater_t = W_t / max(1, W_1..W_t) - 1 (the usual peak-to-trough definition, e.g. Magdon-Ismail and Atiya 2004,
 * "Maximum drawdown", Risk 17(10)).
 */
public final class Drawdowns {

    private static final Comparator<RunBounds> DEEPEST_FIRST =
            Comparator.comparingDouble(RunBounds::depth).thenComparingInt(RunBounds::start);

    private Drawdowns() {
    }

    /**
     * Underwater curve and the {@code top} deepest episodes (ties in depth: earlier first). An episode is a maximal run
     * of consecutive dates with underwater < 0; see {@link DrawdownReport.Episode} for its fields.
     */
    public static DrawdownReport analyze(ReturnSeries series, int top) {
        AnalyticsChecks.notNull(series, "series");
        AnalyticsChecks.atLeast(top, 0, "top");
        LocalDate[] dates = series.dates();
        double[] underwater = underwater(series.values());

        List<RunBounds> runs = new ArrayList<>();
        int n = underwater.length;
        int t = 0;
        while (t < n) {
            if (underwater[t] >= 0.0) {
                t++;
                continue;
            }
            int start = t;
            int trough = t;
            while (t < n && underwater[t] < 0.0) {
                if (underwater[t] < underwater[trough]) {
                    trough = t;
                }
                t++;
            }
            runs.add(new RunBounds(start, t - 1, trough, underwater[trough]));
        }
        runs.sort(DEEPEST_FIRST);

        List<DrawdownReport.Episode> episodes = new ArrayList<>();
        for (RunBounds run : runs.subList(0, Math.min(top, runs.size()))) {
            episodes.add(new DrawdownReport.Episode(
                    run.start > 0 ? dates[run.start - 1] : null,
                    dates[run.trough],
                    run.end + 1 < n ? dates[run.end + 1] : null,
                    run.depth,
                    run.end - run.start + 1));
        }
        return new DrawdownReport(minimumOrZero(underwater), dates, underwater, episodes);
    }

    /** Maximum drawdown min_t underwater_t (0 or negative; 0 when never under water or empty). */
    public static double maxDrawdown(double[] returns) {
        AnalyticsChecks.finiteValues(returns, "returns");
        return minimumOrZero(underwater(returns));
    }

    /** underwater_t = W_t / max(1, W_1..W_t) - 1 for simple returns r_t in date order. */
    static double[] underwater(double[] returns) {
        double[] underwater = new double[returns.length];
        double wealth = 1.0;
        double peak = 1.0;
        for (int t = 0; t < returns.length; t++) {
            wealth *= 1.0 + returns[t];
            peak = Math.max(peak, wealth);
            underwater[t] = wealth / peak - 1.0;
        }
        return underwater;
    }

    private static double minimumOrZero(double[] values) {
        double min = 0.0;
        for (double v : values) {
            min = Math.min(min, v);
        }
        return min;
    }

    /** Index bounds of one run under water, inclusive. */
    private record RunBounds(int start, int end, int trough, double depth) {
    }
}
