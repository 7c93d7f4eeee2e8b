package dev.winnow.stats;

import org.apache.commons.math3.distribution.NormalDistribution;

/**
 * Probabilistic and deflated Sharpe ratios.
 *
 * <p>All Sharpe ratios here are per observation period (not annualised), measured on the same
 * n observations whose skewness and kurtosis are given; kurtosis is the plain (non-excess) kurtosis,
 * 3 for a normal distribution.
 */
public final class SharpeRatios {

    /** Euler-Mascheroni constant. */
    static final double EULER_MASCHERONI = 0.5772156649015329;

    private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(null, 0.0, 1.0);

    private SharpeRatios() {
    }

    /**
     * Probabilistic Sharpe ratio (Bailey and Lopez de Prado 2012, Journal of Risk 15(2)): the
     * probability that the true Sharpe ratio exceeds {@code benchmarkSr}, given an estimate
     * {@code sr} from n observations with the given skewness and (non-excess) kurtosis:
     * <pre>PSR = Phi[ (SR - SR*) sqrt(n - 1) / sqrt(1 - skew SR + (kurt - 1)/4 SR^2) ]</pre>
     *
     * @return the probability, or NaN when n &lt; 2, an input is not finite, or the variance term
     *         under the square root is not positive
     */
    public static double probabilisticSharpe(double sr, double benchmarkSr, int n, double skew, double kurtosis) {
        if (n < 2 || !allFinite(sr, benchmarkSr, skew, kurtosis)) {
            return Double.NaN;
        }
        double varianceTerm = 1.0 - skew * sr + (kurtosis - 1.0) / 4.0 * sr * sr;
        if (!(varianceTerm > 0.0)) {
            return Double.NaN;
        }
        return STANDARD_NORMAL.cumulativeProbability((sr - benchmarkSr) * Math.sqrt(n - 1.0) / Math.sqrt(varianceTerm));
    }

    /**
     * Expected maximum Sharpe ratio among N independent trials whose true Sharpe ratio is zero
     * (Bailey and Lopez de Prado 2014, Journal of Portfolio Management 40(5)):
     * <pre>SR0 = sqrt(V) [ (1 - g) Phi^-1(1 - 1/N) + g Phi^-1(1 - 1/(N e)) ]</pre>
     * with V the variance of the trials' Sharpe ratio estimates and g the Euler-Mascheroni
     * constant; SR0 = 0 for a single trial.
     *
     * @throws IllegalArgumentException when the variance is negative or not finite, or trials &lt; 1
     */
    public static double expectedMaxSharpe(double varianceOfTrialSharpes, int trials) {
        if (!(varianceOfTrialSharpes >= 0.0) || Double.isInfinite(varianceOfTrialSharpes)) {
            throw new IllegalArgumentException("variance of trial Sharpe ratios must be finite and >= 0, got " + varianceOfTrialSharpes);
        }
        if (trials < 1) {
            throw new IllegalArgumentException("number of trials must be at least 1, got " + trials);
        }
        if (trials == 1) {
            return 0.0;
        }
        double quantile = (1.0 - EULER_MASCHERONI) * STANDARD_NORMAL.inverseCumulativeProbability(1.0 - 1.0 / trials)
                + EULER_MASCHERONI * STANDARD_NORMAL.inverseCumulativeProbability(1.0 - 1.0 / (trials * Math.E));
        return Math.sqrt(varianceOfTrialSharpes) * quantile;
    }

    /**
     * Deflated Sharpe ratio (Bailey and Lopez de Prado 2014, Journal of Portfolio Management 40(5)):
     * the probabilistic Sharpe ratio of {@code sr} against the expected maximum Sharpe ratio SR0 of
     * {@code trials} unskilled trials, DSR = PSR(SR0), see {@link #probabilisticSharpe} and
     * {@link #expectedMaxSharpe}. The variance of the trials' Sharpe ratios is in the same per-period
     * units as {@code sr}.
     *
     * @return the probability, or NaN as for {@link #probabilisticSharpe}
     * @throws IllegalArgumentException as for {@link #expectedMaxSharpe}
     */
    public static double deflatedSharpe(double sr, int n, double skew, double kurtosis,
                                        double varianceOfTrialSharpes, int trials) {
        return probabilisticSharpe(sr, expectedMaxSharpe(varianceOfTrialSharpes, trials), n, skew, kurtosis);
    }

    private static boolean allFinite(double... values) {
        for (double v : values) {
            if (!Double.isFinite(v)) {
                return false;
            }
        }
        return true;
    }
}
