package dev.winnow.stats;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The verdict rules of the evidence sections and every threshold they use, in one place. All statistics are on
 * monthly returns. Thresholds (wire names in brackets):
 * <ul>
 *   <li>{@link #MIN_MONTHS} [min_months] = 36: fewest months for a verdict on a statistic (three years; common
 *       practice);</li>
 *   <li>{@link #T_HURDLE} [t_hurdle] = 3.0: the t-statistic hurdle Harvey, Liu and Zhu (2016, Review of Financial
 *       Studies 29(1)) propose for new factors;</li>
 *   <li>{@link #T_WEAK} [t_weak] = 2.0: the conventional two-sided 5% bar, about 1.96 (common practice);</li>
 *   <li>{@link #Q} [q] = 0.05: level of the false discovery rate and of the plain p-value (common practice);</li>
 *   <li>{@link #ROLLING_WINDOW} [rolling_window] = 60 months and {@link #ROLLING_T} [rolling_t] = 2.0: the rolling
 *       windows of the stability section (five years; common practice);</li>
 *   <li>{@link #MIN_SHARE} [min_share] = 0.5: share of rolling windows above rolling_t for a stable premium
 *       (Winnow's choice: significant in most five-year windows).</li>
 * </ul>
 * The sign of a premium is the sign of the full-sample mean monthly return; a zero or undefined mean has no sign and
 * nothing shares it.
 */
public final class EvidenceVerdicts {
    public static final int MIN_MONTHS = 36;
    public static final double T_HURDLE = TrialTable.T3_HURDLE;
    public static final double T_WEAK = 2.0;
    public static final double Q = 0.05;
    public static final int ROLLING_WINDOW = 60;
    public static final double ROLLING_T = 2.0;
    public static final double MIN_SHARE = 0.5;

    private EvidenceVerdicts() {
    }

    /** Segments long enough to count for breadth, and how many of them share the full factor's sign. */
    public record BreadthTally(int counted, int sameSign) {
    }

    /**
     * significance: not_enough_data when n &lt; min_months (or the statistics are undefined); holds when
     * |nw_t| &gt; t_hurdle and p_bh &lt;= q; weak when p_value &lt;= q; fails otherwise.
     */
    public static SectionVerdict significance(TrialRow row) {
        AnalyticsChecks.notNull(row, "row");
        Map<String, Number> th = Section.SIGNIFICANCE.thresholds();
        TrialStatistics s = row.statistics();
        if (s.n() < MIN_MONTHS || !s.defined()) {
            return notEnough(th, "The factor has " + s.n() + " monthly returns" + (s.defined() ? "" : " without a defined t-statistic")
                    + "; a verdict needs at least " + MIN_MONTHS + ".");
        }
        String t = "NW t " + fmt(s.nwTStat());
        if (Math.abs(s.nwTStat()) > T_HURDLE && row.pBh() <= Q) {
            return new SectionVerdict(Verdict.HOLDS, th, t + " clears the hurdle of " + fmt(T_HURDLE)
                    + " and the Benjamini-Hochberg adjusted p-value " + fmt(row.pBh()) + " is at most " + fmt(Q) + ".");
        }
        if (s.pValue() <= Q) {
            return new SectionVerdict(Verdict.WEAK, th, t + " is significant on its own (p " + fmt(s.pValue())
                    + ") but not after counting every trial (|t| needs to exceed " + fmt(T_HURDLE) + " and p_bh " + fmt(row.pBh())
                    + " to be at most " + fmt(Q) + ").");
        }
        return new SectionVerdict(Verdict.FAILS, th, t + " is not significant even on its own (p " + fmt(s.pValue())
                + " above " + fmt(Q) + ").");
    }

    /**
     * stability: not_enough_data when n &lt; rolling_window; holds when both halves' means share the full-sample
     * mean's sign and the share of rolling windows with NW t above rolling_t is at least min_share; weak when both
     * halves share the sign; fails otherwise.
     */
    public static SectionVerdict stability(int n, double fullMean, StabilityReport report) {
        AnalyticsChecks.notNull(report, "report");
        Map<String, Number> th = Section.STABILITY.thresholds();
        if (n < ROLLING_WINDOW) {
            return notEnough(th, "The factor has " + n + " monthly returns, fewer than one rolling window of " + ROLLING_WINDOW + ".");
        }
        boolean halvesAgree = report.halves().stream().allMatch(h -> sameSign(h.mean(), fullMean));
        String share = fmt(report.shareAbove()) + " of the " + ROLLING_WINDOW + "-month windows have NW t above " + fmt(ROLLING_T);
        if (halvesAgree && report.shareAbove() >= MIN_SHARE) {
            return new SectionVerdict(Verdict.HOLDS, th, "Both halves' means have the full sample's sign and "
                    + share + " (at least " + fmt(MIN_SHARE) + ").");
        }
        if (halvesAgree) {
            return new SectionVerdict(Verdict.WEAK, th, "Both halves' means have the full sample's sign, but only "
                    + share + " (needs " + fmt(MIN_SHARE) + ").");
        }
        return new SectionVerdict(Verdict.FAILS, th, "One half of the sample has a mean of the other sign than the full sample (or none).");
    }

    /** The evidence sections, each with the thresholds its rule uses. */
    public enum Section {
        SIGNIFICANCE("min_months", MIN_MONTHS, "t_hurdle", T_HURDLE, "q", Q),
        STABILITY("rolling_window", ROLLING_WINDOW, "rolling_t", ROLLING_T, "min_share", MIN_SHARE),
        BREADTH("min_months", MIN_MONTHS),
        VARIANTS("min_months", MIN_MONTHS, "t_weak", T_WEAK),
        AFTER_COSTS("min_months", MIN_MONTHS, "t_weak", T_WEAK),
        RATIONALE(),
        REDUNDANCY("min_months", MIN_MONTHS, "t_weak", T_WEAK);

        private final Object[] namesAndValues;

        Section(Object... namesAndValues) {
            this.namesAndValues = namesAndValues;
        }

        /** The section's thresholds by wire name, in a fixed order. */
        public Map<String, Number> thresholds() {
            Map<String, Number> out = new LinkedHashMap<>();
            for (int i = 0; i < namesAndValues.length; i += 2) {
                out.put((String) namesAndValues[i], (Number) namesAndValues[i + 1]);
            }
            return out;
        }
    }

    /** Counts the segments with at least min_months returns, and those among them whose mean shares fullMean's sign. */
    public static BreadthTally tallyBreadth(List<PeriodStatistics> segments, double fullMean) {
        AnalyticsChecks.notNull(segments, "segments");
        int counted = 0;
        int same = 0;
        for (PeriodStatistics s : segments) {
            if (s.n() >= MIN_MONTHS) {
                counted++;
                same += sameSign(s.mean(), fullMean) ? 1 : 0;
            }
        }
        return new BreadthTally(counted, same);
    }

    /**
     * breadth: not_enough_data with fewer than two segments of at least min_months; holds when every such segment's
     * mean shares the full factor's sign; weak when more than half do; fails otherwise.
     */
    public static SectionVerdict breadth(BreadthTally tally) {
        AnalyticsChecks.notNull(tally, "tally");
        Map<String, Number> th = Section.BREADTH.thresholds();
        String counted = tally.sameSign() + " of " + tally.counted() + " segments with at least " + MIN_MONTHS + " months";
        if (tally.counted() < 2) {
            return notEnough(th, "Only " + tally.counted() + " segment(s) have at least " + MIN_MONTHS + " monthly returns; a verdict needs two.");
        }
        if (tally.sameSign() == tally.counted()) {
            return new SectionVerdict(Verdict.HOLDS, th, "All " + counted + " have a mean with the full factor's sign.");
        }
        if (2 * tally.sameSign() > tally.counted()) {
            return new SectionVerdict(Verdict.WEAK, th, "Only " + counted + " have a mean with the full factor's sign.");
        }
        return new SectionVerdict(Verdict.FAILS, th, "No more than half (" + counted + ") have a mean with the full factor's sign.");
    }

    /**
     * variants: not_enough_data without a theme, without another member, or with a composite shorter than min_months;
     * holds when every member's NW t has this factor's sign and the composite's NW t exceeds t_weak in that direction;
     * weak when the composite's mean has that sign; fails otherwise.
     *
     * @param memberTStats NW t of every member, this factor included
     */
    public static SectionVerdict variants(String theme, double factorMean, double[] memberTStats, PeriodStatistics composite) {
        Map<String, Number> th = Section.VARIANTS.thresholds();
        if (theme == null) {
            return notEnough(th, "The definition declares no theme, so there are no variants to compare.");
        }
        if (memberTStats.length < 2 || composite == null) {
            return notEnough(th, "No other live factor shares the theme '" + theme + "'.");
        }
        if (composite.n() < MIN_MONTHS) {
            return notEnough(th, "The theme's members share " + composite.n() + " months; a verdict needs at least " + MIN_MONTHS + ".");
        }
        double sign = Math.signum(factorMean);
        boolean allAgree = sign != 0.0;
        for (double t : memberTStats) {
            allAgree &= sameSign(t, factorMean);
        }
        String compositeT = "the composite's NW t is " + fmt(composite.nwTStat());
        if (allAgree && sign * composite.nwTStat() > T_WEAK) {
            return new SectionVerdict(Verdict.HOLDS, th, "Every variant's NW t has this factor's sign and "
                    + compositeT + ", beyond " + fmt(T_WEAK) + ".");
        }
        if (sameSign(composite.mean(), factorMean)) {
            return new SectionVerdict(Verdict.WEAK, th, "The composite's mean has this factor's sign, but "
                    + (allAgree ? compositeT + ", not beyond " + fmt(T_WEAK) : "not every variant does") + ".");
        }
        return new SectionVerdict(Verdict.FAILS, th, "The theme's composite mean does not have this factor's sign.");
    }

    /**
     * after_costs: not_enough_data for a series without turnover (external) or n &lt; min_months; holds when the mean
     * net return is above zero with NW t above t_weak; weak when it is above zero; fails otherwise.
     */
    public static SectionVerdict afterCosts(boolean hasTurnover, int n, double meanNet, double nwTStatNet) {
        Map<String, Number> th = Section.AFTER_COSTS.thresholds();
        if (!hasTurnover) {
            return notEnough(th, "The series is uploaded, not built, so Winnow knows no turnover or trading cost for it.");
        }
        if (n < MIN_MONTHS) {
            return notEnough(th, "The net series has " + n + " monthly returns; a verdict needs at least " + MIN_MONTHS + ".");
        }
        String net = "The mean net return is " + fmt(meanNet) + " a month with NW t " + fmt(nwTStatNet);
        if (meanNet > 0 && nwTStatNet > T_WEAK) {
            return new SectionVerdict(Verdict.HOLDS, th, net + ", above " + fmt(T_WEAK) + ".");
        }
        if (meanNet > 0) {
            return new SectionVerdict(Verdict.WEAK, th, net + ": positive, but not above " + fmt(T_WEAK) + ".");
        }
        return new SectionVerdict(Verdict.FAILS, th, net + ": costs leave nothing.");
    }

    /** rationale: holds when the definition states one, fails when it does not. */
    public static SectionVerdict rationale(String text) {
        if (text == null || text.isBlank()) {
            return new SectionVerdict(Verdict.FAILS, Section.RATIONALE.thresholds(), "The definition states no economic reason for the premium.");
        }
        return new SectionVerdict(Verdict.HOLDS, Section.RATIONALE.thresholds(), "The definition states an economic reason for the premium.");
    }

    /**
     * redundancy: not_enough_data without other factors, with fewer than min_months common months or when the
     * regression is not identified; holds (not explained by the others) when |alpha NW t| &gt; t_weak; fails otherwise.
     */
    public static SectionVerdict redundancy(int otherFactors, SpanningRegression regression) {
        AnalyticsChecks.notNull(regression, "regression");
        Map<String, Number> th = Section.REDUNDANCY.thresholds();
        if (otherFactors == 0) {
            return notEnough(th, "There is no other live factor with at least " + MIN_MONTHS + " months in common to regress on.");
        }
        if (regression.n() < MIN_MONTHS) {
            return notEnough(th, "The factors share " + regression.n() + " months; a verdict needs at least " + MIN_MONTHS + ".");
        }
        if (Double.isNaN(regression.alphaNwTStat())) {
            return notEnough(th, "The regression is not identified (the other factors are collinear); choose them with 'against'.");
        }
        String alpha = "The alpha's NW t is " + fmt(regression.alphaNwTStat());
        if (Math.abs(regression.alphaNwTStat()) > T_WEAK) {
            return new SectionVerdict(Verdict.HOLDS, th, alpha + ": the other factors do not explain the premium.");
        }
        return new SectionVerdict(Verdict.FAILS, th, alpha + ", within " + fmt(T_WEAK) + ": the other factors explain the premium.");
    }

    /** A not_enough_data verdict of a section, with that section's thresholds, for a reason found before its rule. */
    public static SectionVerdict notEnoughData(Section section, String reason) {
        return notEnough(section.thresholds(), reason);
    }

    private static SectionVerdict notEnough(Map<String, Number> thresholds, String reason) {
        return new SectionVerdict(Verdict.NOT_ENOUGH_DATA, thresholds, reason);
    }

    private static boolean sameSign(double value, double reference) {
        return reference != 0.0 && !Double.isNaN(reference) && Math.signum(value) == Math.signum(reference);
    }

    private static String fmt(double value) {
        return Double.isNaN(value) ? "undefined" : String.format(java.util.Locale.ROOT, "%.3g", value);
    }
}
