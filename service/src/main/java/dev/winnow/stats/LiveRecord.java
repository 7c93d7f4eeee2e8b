package dev.winnow.stats;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * How a factor did after it was written down: the monthly returns of months ending after the date Winnow recorded the
 * version's definition (live months) against the months before. For each side: n, mean, the Newey and West (1987,
 * Econometrica 55(3)) t of the mean ({@link PeriodStatistics}) and sharpe_monthly = mean / stdev (divisor n - 1, not
 * annualised); mean_ratio = live mean / earlier mean. A live record is out-of-sample by construction, as McLean and
 * Pontiff (2016, "Does Academic Research Destroy Stock Return Predictability?", Journal of Finance 71(1)) use
 * publication dates.
 *
 * <p>Verdict: not_enough_data with fewer than min_live_months = 12 live months (Winnow's choice: one year); holds when
 * the live mean has the earlier mean's sign and the live NW t times that sign exceeds live_t = 1 (Winnow's choice: a
 * short live record is judged with a low bar); weak when only the sign agrees; fails otherwise.
 */
public final class LiveRecord {
    public static final int MIN_LIVE_MONTHS = 12;
    public static final double LIVE_T = 1.0;

    private LiveRecord() {
    }

    /** One side of the split. */
    public record Side(int n, double mean, double nwTStat, double sharpeMonthly) {
        static Side of(ReturnSeries s) {
            PeriodStatistics p = PeriodStatistics.of(s);
            double[] v = s.values();
            double sd = Double.NaN;
            if (v.length >= 2) {
                double ss = 0.0;
                for (double x : v) {
                    ss += (x - p.mean()) * (x - p.mean());
                }
                sd = Math.sqrt(ss / (v.length - 1));
            }
            return new Side(p.n(), p.mean(), p.nwTStat(), sd > 0 ? p.mean() / sd : Double.NaN);
        }
    }

    public record Result(LocalDate definedOn, Side before, Side after, double meanRatio, SectionVerdict verdict) {
    }

    public static Map<String, Number> thresholds() {
        Map<String, Number> th = new LinkedHashMap<>();
        th.put("min_live_months", MIN_LIVE_MONTHS);
        th.put("live_t", LIVE_T);
        return th;
    }

    /**
     * @param monthly   monthly returns dated by the month's last day (the evidence basis)
     * @param definedOn the day the version was defined; months dated after it are live
     */
    public static Result of(ReturnSeries monthly, LocalDate definedOn) {
        AnalyticsChecks.notNull(monthly, "monthly");
        AnalyticsChecks.notNull(definedOn, "definedOn");
        Side before = Side.of(monthly.between(null, definedOn));
        Side after = Side.of(monthly.between(definedOn.plusDays(1), null));
        double ratio = before.mean() != 0 ? after.mean() / before.mean() : Double.NaN;
        return new Result(definedOn, before, after, ratio, verdict(before, after));
    }

    private static SectionVerdict verdict(Side before, Side after) {
        Map<String, Number> th = thresholds();
        if (after.n() < MIN_LIVE_MONTHS) {
            return new SectionVerdict(Verdict.NOT_ENOUGH_DATA, th, "The version has " + after.n()
                    + " live months since its definition; a verdict needs at least " + MIN_LIVE_MONTHS + ".");
        }
        double sign = Math.signum(before.mean());
        boolean sameSign = sign != 0 && !Double.isNaN(sign) && Math.signum(after.mean()) == sign;
        String live = "The live mean " + Monotonicity.fmt(after.mean()) + " (NW t " + Monotonicity.fmt(after.nwTStat()) + ")";
        if (sameSign && sign * after.nwTStat() > LIVE_T) {
            return new SectionVerdict(Verdict.HOLDS, th, live + " has the earlier mean's sign and its t beyond "
                    + Monotonicity.fmt(LIVE_T) + " in that direction.");
        }
        if (sameSign) {
            return new SectionVerdict(Verdict.WEAK, th, live + " has the earlier mean's sign, but its t is not beyond "
                    + Monotonicity.fmt(LIVE_T) + " in that direction.");
        }
        return new SectionVerdict(Verdict.FAILS, th, live + " does not have the earlier mean's sign "
                + Monotonicity.fmt(before.mean()) + ".");
    }
}
