package dev.winnow.stats;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Do returns rise steadily across all buckets of a sort, or only at one extreme? On monthly bucket returns
 * r_1 .. r_B (bucket 1 lowest signal) and s = +1 for high_minus_low, -1 for low_minus_high:
 * <ul>
 *   <li>each bucket: n, mean and Newey-West (1987) t of its monthly returns ({@link PeriodStatistics});</li>
 *   <li>each step j to j+1: the series s (r_{j+1} - r_j) on the months both buckets have, with n, mean and NW t;</li>
 *   <li>steps_in_direction = number of steps with a positive mean; min_step_t = the smallest step NW t;</li>
 *   <li>rank_correlation = Spearman (1904) correlation between s j and the bucket means.</li>
 * </ul>
 * Verdict (thresholds by wire name): not_enough_data when a bucket has fewer than min_months = 36 months (common
 * practice, as the other sections) or a mean is undefined; holds when every step mean is positive and the factor
 * spread's NW t exceeds t_weak = 2; weak when rank_correlation is at least min_rank_correlation = 0.8 (Winnow's
 * choice: the bucket means are nearly ordered); fails otherwise. The idea of testing all adjacent differences follows
 * Patton and Timmermann (2010, "Monotonicity in asset returns", Journal of Financial Economics 98(3)); this is the
 * simple per-step form, not their bootstrap test.
 */
public final class Monotonicity {
    public static final double MIN_RANK_CORRELATION = 0.8;

    private Monotonicity() {
    }

    /** One step between adjacent buckets. */
    public record Step(int from, int to, int n, double mean, double nwTStat) {
    }

    /** One bucket's monthly statistics. */
    public record Bucket(int bucket, int n, double mean, double nwTStat) {
    }

    public record Result(List<Bucket> buckets, List<Step> steps, int stepsInDirection, double minStepT,
                         double rankCorrelation, SectionVerdict verdict) {
        public Result {
            buckets = List.copyOf(buckets);
            steps = List.copyOf(steps);
        }
    }

    public static Map<String, Number> thresholds() {
        Map<String, Number> th = new LinkedHashMap<>();
        th.put("min_months", EvidenceVerdicts.MIN_MONTHS);
        th.put("t_weak", EvidenceVerdicts.T_WEAK);
        th.put("min_rank_correlation", MIN_RANK_CORRELATION);
        return th;
    }

    /**
     * @param buckets      monthly returns of buckets 1..B, in bucket order (at least 2)
     * @param highMinusLow true for s = +1
     * @param spreadNwT    NW t of the factor's monthly spread
     */
    public static Result of(List<ReturnSeries> buckets, boolean highMinusLow, double spreadNwT) {
        AnalyticsChecks.notNull(buckets, "buckets");
        if (buckets.size() < 2) {
            throw new IllegalArgumentException("monotonicity needs at least 2 buckets, got " + buckets.size());
        }
        double s = highMinusLow ? 1.0 : -1.0;
        int b = buckets.size();
        List<Bucket> stats = new ArrayList<>();
        double[] means = new double[b];
        double[] order = new double[b];
        int shortest = Integer.MAX_VALUE;
        for (int j = 0; j < b; j++) {
            PeriodStatistics p = PeriodStatistics.of(AnalyticsChecks.notNull(buckets.get(j), "buckets[" + j + "]"));
            stats.add(new Bucket(j + 1, p.n(), p.mean(), p.nwTStat()));
            means[j] = p.mean();
            order[j] = s * (j + 1);
            shortest = Math.min(shortest, p.n());
        }
        List<Step> steps = new ArrayList<>();
        int inDirection = 0;
        double minT = Double.NaN;
        boolean allPositive = true;
        for (int j = 0; j + 1 < b; j++) {
            DateAlignment.Common common = DateAlignment.common(buckets.get(j + 1), buckets.get(j));
            int n = common.size();
            double[] diff = new double[n];
            for (int t = 0; t < n; t++) {
                diff[t] = s * (common.x()[t] - common.y()[t]);
            }
            double mean = n == 0 ? Double.NaN : WindowMoments.mean(diff, 0, n);
            double nwT = NeweyWest.tStat(diff, NeweyWest.automaticLags(n));
            steps.add(new Step(j + 1, j + 2, n, mean, nwT));
            inDirection += mean > 0 ? 1 : 0;
            allPositive &= mean > 0;
            minT = Double.isNaN(minT) || nwT < minT ? nwT : minT;
        }
        boolean meansDefined = true;
        for (double m : means) {
            meansDefined &= Double.isFinite(m);
        }
        double rho = meansDefined ? Correlations.spearman(order, means) : Double.NaN;
        return new Result(stats, steps, inDirection, minT, rho, verdict(shortest, meansDefined, allPositive, spreadNwT, rho, b));
    }

    private static SectionVerdict verdict(int shortest, boolean meansDefined, boolean allPositive, double spreadNwT,
                                          double rho, int b) {
        Map<String, Number> th = thresholds();
        if (shortest < EvidenceVerdicts.MIN_MONTHS || !meansDefined) {
            return new SectionVerdict(Verdict.NOT_ENOUGH_DATA, th, "A bucket has " + shortest
                    + " monthly returns; a verdict needs at least " + EvidenceVerdicts.MIN_MONTHS + " in every bucket.");
        }
        if (allPositive && spreadNwT > EvidenceVerdicts.T_WEAK) {
            return new SectionVerdict(Verdict.HOLDS, th, "Every one of the " + (b - 1) + " steps has a mean in the factor's"
                    + " direction and the spread's NW t " + fmt(spreadNwT) + " exceeds " + fmt(EvidenceVerdicts.T_WEAK) + ".");
        }
        if (rho >= MIN_RANK_CORRELATION) {
            return new SectionVerdict(Verdict.WEAK, th, "The bucket means are nearly ordered (rank correlation " + fmt(rho)
                    + ", at least " + fmt(MIN_RANK_CORRELATION) + "), but " + (allPositive
                    ? "the spread's NW t " + fmt(spreadNwT) + " does not exceed " + fmt(EvidenceVerdicts.T_WEAK)
                    : "not every step has a mean in the factor's direction") + ".");
        }
        return new SectionVerdict(Verdict.FAILS, th, "The bucket means are not ordered in the factor's direction (rank"
                + " correlation " + fmt(rho) + ", below " + fmt(MIN_RANK_CORRELATION) + ").");
    }

    static String fmt(double value) {
        return Double.isNaN(value) ? "undefined" : String.format(java.util.Locale.ROOT, "%.3g", value);
    }
}
