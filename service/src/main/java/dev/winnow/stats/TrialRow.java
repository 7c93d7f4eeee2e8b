package dev.winnow.stats;

/**
 * One trial's row of the {@link TrialTable}: its own statistics and those that depend on all trials.
 * Every field but {@code statistics} is NaN (passesT3 null) when the trial is not {@link TrialStatistics#defined()}.
 *
 * @param statistics     the trial's own statistics
 * @param pBonferroni    Bonferroni-adjusted p-value across the N defined trials
 * @param pHolm          Holm (1979) step-down adjusted p-value
 * @param pBh            Benjamini-Hochberg (1995) step-up adjusted p-value
 * @param pBy            Benjamini-Yekutieli (2001) adjusted p-value
 * @param passesT3       |nwTStat| &gt; 3.0 (Harvey, Liu and Zhu 2016); null when undefined
 * @param psr            probabilistic Sharpe ratio against zero
 * @param deflatedSharpe deflated Sharpe ratio against the expected maximum of N unskilled trials
 */
public record TrialRow(TrialStatistics statistics, double pBonferroni, double pHolm, double pBh, double pBy,
                       Boolean passesT3, double psr, double deflatedSharpe) {
}
