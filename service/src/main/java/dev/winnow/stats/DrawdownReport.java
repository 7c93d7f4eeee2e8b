package dev.winnow.stats;

import java.time.LocalDate;
import java.util.List;

/**
 * Drawdown analysis of a return series; see {@link Drawdowns#analyze(ReturnSeries, int)}.
 *
 * @param maxDrawdown     lowest underwater value (0 or negative; 0 when never under water)
 * @param underwaterDates the series' dates
 * @param underwater      wealth / running peak - 1 at each date
 * @param episodes        the deepest episodes, deepest first
 */
public record DrawdownReport(double maxDrawdown, LocalDate[] underwaterDates, double[] underwater, List<Episode> episodes) {

    public DrawdownReport {
        underwaterDates = AnalyticsChecks.notNull(underwaterDates, "underwaterDates").clone();
        underwater = AnalyticsChecks.notNull(underwater, "underwater").clone();
        episodes = List.copyOf(AnalyticsChecks.notNull(episodes, "episodes"));
    }

    @Override
    public LocalDate[] underwaterDates() {
        return underwaterDates.clone();
    }

    @Override
    public double[] underwater() {
        return underwater.clone();
    }

    /**
     * One maximal run of consecutive dates under water.
     *
     * @param peak     date before the run, the last date at the running peak; null when the run starts at the first date
     * @param trough   date of the lowest underwater value in the run (the first on ties)
     * @param recovery first date after the run (back at the peak); null while still under water
     * @param depth    lowest underwater value in the run (negative)
     * @param duration number of dates in the run
     */
    public record Episode(LocalDate peak, LocalDate trough, LocalDate recovery, double depth, int duration) {
    }
}
