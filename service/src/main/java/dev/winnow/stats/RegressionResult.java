package dev.winnow.stats;

import java.util.Arrays;
import java.util.Objects;

/**
 * Result of an OLS regression with intercept, y_t = alpha + sum_j beta_j x_tj + u_t.
 * When the coefficients are not identified (fewer than k + 1 usable rows, or collinear regressors)
 * every statistic is NaN. Arrays are defensively copied; the record is immutable.
 *
 * @param n              observations used (rows with a NaN were dropped)
 * @param k              regressors, not counting the intercept
 * @param alpha          intercept
 * @param betas          slope per regressor, in input order (length k)
 * @param standardErrors classical OLS standard errors, intercept first (length k + 1):
 *                       sqrt(diag(s^2 (X'X)^-1)) with s the residual standard deviation
 * @param rSquared       1 - SSR / SST with SST centred on the mean of y
 * @param residualStdev  s = sqrt(SSR / (n - k - 1)), NaN when n = k + 1
 * @param residuals      y_t - fitted_t aligned with the input rows, NaN on dropped rows
 */
public record RegressionResult(int n, int k, double alpha, double[] betas, double[] standardErrors,
                               double rSquared, double residualStdev, double[] residuals) {

    public RegressionResult {
        Objects.requireNonNull(betas, "betas");
        Objects.requireNonNull(standardErrors, "standardErrors");
        Objects.requireNonNull(residuals, "residuals");
        if (betas.length != k || standardErrors.length != k + 1) {
            throw new IllegalArgumentException("expected " + k + " betas and " + (k + 1) + " standard errors, got "
                    + betas.length + " and " + standardErrors.length);
        }
        betas = betas.clone();
        standardErrors = standardErrors.clone();
        residuals = residuals.clone();
    }

    /** Classical t-statistic of the intercept, alpha / standardErrors[0]. */
    public double alphaT() {
        return alpha / standardErrors[0];
    }

    public double beta(int j) {
        return betas[j];
    }

    @Override
    public double[] betas() {
        return betas.clone();
    }

    @Override
    public double[] standardErrors() {
        return standardErrors.clone();
    }

    @Override
    public double[] residuals() {
        return residuals.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof RegressionResult r && n == r.n && k == r.k
                && Double.compare(alpha, r.alpha) == 0 && Arrays.equals(betas, r.betas)
                && Arrays.equals(standardErrors, r.standardErrors) && Double.compare(rSquared, r.rSquared) == 0
                && Double.compare(residualStdev, r.residualStdev) == 0 && Arrays.equals(residuals, r.residuals);
    }

    @Override
    public int hashCode() {
        return Objects.hash(n, k, alpha, Arrays.hashCode(betas), Arrays.hashCode(standardErrors), rSquared,
                residualStdev, Arrays.hashCode(residuals));
    }

    @Override
    public String toString() {
        return "RegressionResult[n=" + n + ", k=" + k + ", alpha=" + alpha + ", betas=" + Arrays.toString(betas)
                + ", rSquared=" + rSquared + ", residualStdev=" + residualStdev + "]";
    }
}
