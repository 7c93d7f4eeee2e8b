package dev.winnow.stats;

import java.util.ArrayList;
import java.util.List;

/**
 * The library-wide table of trials: every factor version ever built is a trial, and the haircuts count them all.
 * Only the trials whose p-value and Sharpe ratio are defined ({@link TrialStatistics#defined()}) count towards N;
 * the others keep their place in {@link #rows()} with undefined statistics.
 *
 * <ul>
 *   <li>Adjusted p-values across the N trials ({@link MultipleTesting}): Bonferroni; Holm (1979, Scandinavian
 *       Journal of Statistics 6) step-down; Benjamini and Hochberg (1995, JRSS B 57(1)) step-up; Benjamini and
 *       Yekutieli (2001, Annals of Statistics 29(4)) with c(N) = sum_{i=1..N} 1/i. Each is the usual adjusted
 *       p-value (monotone, capped at 1), so "adjusted p &lt;= q" is the procedure's decision at level q.</li>
 *   <li>passes_t3: |nw_t| &gt; 3.0, the hurdle Harvey, Liu and Zhu (2016, Review of Financial Studies 29(1)) propose
 *       for new factors.</li>
 *   <li>PSR against zero (Bailey and Lopez de Prado 2012, Journal of Risk 15(2)):
 *       Phi[SR sqrt(n-1) / sqrt(1 - skew SR + (kurt-1)/4 SR^2)].</li>
 *   <li>Deflated Sharpe ratio (Bailey and Lopez de Prado 2014, Journal of Portfolio Management 40(5)):
 *       SR0 = sqrt(V) [(1-g) Phi^-1(1-1/N) + g Phi^-1(1-1/(N e))], g the Euler-Mascheroni constant and V the
 *       sample variance (divisor N-1) of the N trials' monthly Sharpe ratios; SR0 = 0 when N = 1; then
 *       DSR = Phi[(SR - SR0) sqrt(n-1) / sqrt(1 - skew SR + (kurt-1)/4 SR^2)] with the trial's own n, population
 *       skewness and non-excess kurtosis (see {@link SharpeRatios}).</li>
 * </ul>
 *
 * @param trials            N, the number of defined trials
 * @param sharpeVariance    V, NaN when N &lt; 2
 * @param expectedMaxSharpe SR0, NaN when N = 0
 * @param rows              one row per input trial, in input order
 */
public record TrialTable(int trials, double sharpeVariance, double expectedMaxSharpe, List<TrialRow> rows) {

    /** The t-statistic hurdle of Harvey, Liu and Zhu (2016) behind passes_t3. */
    public static final double T3_HURDLE = 3.0;

    public TrialTable {
        rows = List.copyOf(AnalyticsChecks.notNull(rows, "rows"));
    }

    /** The table of the given trials, in their order. */
    public static TrialTable of(List<TrialStatistics> trials) {
        AnalyticsChecks.notNull(trials, "trials");
        int size = trials.size();
        double[] p = new double[size];
        int n = 0;
        double sharpeSum = 0.0;
        for (int i = 0; i < size; i++) {
            TrialStatistics t = AnalyticsChecks.notNull(trials.get(i), "trials[" + i + "]");
            p[i] = t.defined() ? t.pValue() : Double.NaN;
            if (t.defined()) {
                n++;
                sharpeSum += t.sharpe();
            }
        }
        double variance = sharpeVariance(trials, n, sharpeSum / n);
        double sr0 = n == 0 ? Double.NaN : n == 1 ? 0.0 : SharpeRatios.expectedMaxSharpe(variance, n);
        double[] bonferroni = MultipleTesting.bonferroni(p);
        double[] holm = MultipleTesting.holm(p);
        double[] bh = MultipleTesting.benjaminiHochberg(p);
        double[] by = MultipleTesting.benjaminiYekutieli(p);
        List<TrialRow> rows = new ArrayList<>(size);
        for (int i = 0; i < size; i++) {
            TrialStatistics t = trials.get(i);
            if (!t.defined()) {
                double nan = Double.NaN;
                rows.add(new TrialRow(t, nan, nan, nan, nan, null, nan, nan));
                continue;
            }
            double psr = SharpeRatios.probabilisticSharpe(t.sharpe(), 0.0, t.n(), t.skewness(), t.kurtosis());
            double dsr = SharpeRatios.probabilisticSharpe(t.sharpe(), sr0, t.n(), t.skewness(), t.kurtosis());
            rows.add(new TrialRow(t, bonferroni[i], holm[i], bh[i], by[i], Math.abs(t.nwTStat()) > T3_HURDLE, psr, dsr));
        }
        return new TrialTable(n, variance, sr0, rows);
    }

    /** Sample variance (divisor N-1) of the defined trials' Sharpe ratios, from deviations; NaN when N &lt; 2. */
    private static double sharpeVariance(List<TrialStatistics> trials, int n, double mean) {
        if (n < 2) {
            return Double.NaN;
        }
        double sum = 0.0;
        for (TrialStatistics t : trials) {
            if (t.defined()) {
                sum += (t.sharpe() - mean) * (t.sharpe() - mean);
            }
        }
        return sum / (n - 1);
    }
}
