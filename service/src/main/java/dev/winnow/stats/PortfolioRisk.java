package dev.winnow.stats;

/**
 * Risk of a portfolio in a linear factor model, and its Euler decomposition into factor and specific parts.
 *
 * <p>With factor exposures x (K), factor covariance F (K x K) and specific variance s^2:
 * <pre>
 * factor variance   = x' F x
 * total variance    = x' F x + s^2,      sigma = sqrt(total variance)
 * marginal_k        = (F x)_k / sigma     (d sigma / d x_k)
 * contribution_k    = x_k marginal_k
 * specific contrib. = s^2 / sigma
 * share             = contribution / sigma
 * </pre>
 * The contributions and the specific contribution add up to sigma, because sigma is homogeneous of degree one in
 * the positions (Euler's theorem on homogeneous functions); this is the risk attribution of Grinold and Kahn,
 * Active Portfolio Management, 2nd ed. (2000), chapter 3, and Litterman (1996), "Hot Spots and Hedges", Goldman
 * Sachs Risk Management Series.
 *
 * @param factorVariance   x' F x
 * @param specificVariance s^2
 * @param totalVolatility  sigma
 * @param marginal         per factor
 * @param contributions    per factor
 * @param shares           per factor
 */
public record PortfolioRisk(double factorVariance, double specificVariance, double totalVolatility, double[] marginal,
                            double[] contributions, double[] shares, double specificContribution, double specificShare) {

    public PortfolioRisk {
        marginal = marginal.clone();
        contributions = contributions.clone();
        shares = shares.clone();
    }

    @Override
    public double[] marginal() {
        return marginal.clone();
    }

    @Override
    public double[] contributions() {
        return contributions.clone();
    }

    @Override
    public double[] shares() {
        return shares.clone();
    }

    public double factorVolatility() {
        return Math.sqrt(factorVariance);
    }

    public double specificVolatility() {
        return Math.sqrt(specificVariance);
    }

    /**
     * Specific variance of weights w_i on securities with residual volatilities s_i (per period), annualised:
     * s^2 = periodsPerYear x sum_i w_i^2 s_i^2 (residuals uncorrelated across securities, the assumption of a
     * factor model; Grinold and Kahn 2000, chapter 3).
     */
    public static double specificVariance(double[] weights, double[] residualVol, int periodsPerYear) {
        AnalyticsChecks.finiteValues(weights, "weights");
        AnalyticsChecks.finiteValues(residualVol, "residualVol");
        AnalyticsChecks.atLeast(periodsPerYear, 1, "periodsPerYear");
        if (weights.length != residualVol.length) {
            throw new IllegalArgumentException("one residual volatility per weight: " + weights.length + " vs " + residualVol.length);
        }
        double sum = 0.0;
        for (int i = 0; i < weights.length; i++) {
            sum += weights[i] * weights[i] * residualVol[i] * residualVol[i];
        }
        return periodsPerYear * sum;
    }

    /**
     * The decomposition of the class comment. The total variance must be positive (a portfolio with no exposure
     * and no specific risk has nothing to decompose), else IllegalArgumentException.
     */
    public static PortfolioRisk of(double[] exposures, double[][] covariance, double specificVariance) {
        AnalyticsChecks.finiteValues(exposures, "exposures");
        AnalyticsChecks.notNull(covariance, "covariance");
        int k = exposures.length;
        if (covariance.length != k) {
            throw new IllegalArgumentException("covariance must be " + k + " x " + k + ", got " + covariance.length + " rows");
        }
        for (int i = 0; i < k; i++) {
            AnalyticsChecks.finiteValues(covariance[i], "covariance[" + i + "]");
            if (covariance[i].length != k) {
                throw new IllegalArgumentException("covariance row " + i + " has " + covariance[i].length + " columns; expected " + k);
            }
        }
        if (!Double.isFinite(specificVariance) || specificVariance < 0) {
            throw new IllegalArgumentException("specificVariance must be finite and not negative, got " + specificVariance);
        }
        double[] fx = new double[k];
        double factorVariance = 0.0;
        for (int i = 0; i < k; i++) {
            double s = 0.0;
            for (int j = 0; j < k; j++) {
                s += covariance[i][j] * exposures[j];
            }
            fx[i] = s;
            factorVariance += exposures[i] * s;
        }
        double total = factorVariance + specificVariance;
        if (!(total > 0)) {
            throw new IllegalArgumentException("total variance is " + total + "; it must be positive to decompose");
        }
        double sigma = Math.sqrt(total);
        double[] marginal = new double[k];
        double[] contributions = new double[k];
        double[] shares = new double[k];
        for (int i = 0; i < k; i++) {
            marginal[i] = fx[i] / sigma;
            contributions[i] = exposures[i] * marginal[i];
            shares[i] = contributions[i] / sigma;
        }
        double specificContribution = specificVariance / sigma;
        return new PortfolioRisk(factorVariance, specificVariance, sigma, marginal, contributions, shares,
                specificContribution, specificContribution / sigma);
    }
}
