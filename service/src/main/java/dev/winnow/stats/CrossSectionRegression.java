package dev.winnow.stats;

/**
 * One period's cross-sectional regression of a Fama-MacBeth study (Fama and MacBeth 1973, Journal of Political
 * Economy 81(3), 607-636): y_i = g_0 + sum_j g_j x_ij + u_i over the securities i of the period's sample, by
 * ordinary least squares, or by weighted least squares minimising sum_i w_i u_i^2 (solved as OLS on rows scaled by
 * sqrt(w_i), Householder QR, never X'X).
 *
 * <p>r_squared = 1 - SSR / SST with SSR = sum w_i u_i^2 and SST = sum w_i (y_i - ybar_w)^2, ybar_w = sum w_i y_i /
 * sum w_i (w_i = 1 for OLS). A period with n &lt;= k + 1 securities or a rank-deficient design has no fit.
 *
 * @param coefficients intercept first, then one slope per regressor column
 * @param rSquared     weighted coefficient of determination; NaN when SST is 0
 */
public record CrossSectionRegression(double[] coefficients, double rSquared) {

    public CrossSectionRegression {
        coefficients = AnalyticsChecks.notNull(coefficients, "coefficients").clone();
    }

    @Override
    public double[] coefficients() {
        return coefficients.clone();
    }

    /**
     * @param y       responses, finite, length n
     * @param x       k regressor columns of length n, finite
     * @param weights null for OLS, else positive finite weights of length n
     * @return the fit, or null when n &lt;= k + 1 or the design [1, X] is rank deficient
     */
    public static CrossSectionRegression fit(double[] y, double[][] x, double[] weights) {
        AnalyticsChecks.finiteValues(y, "y");
        AnalyticsChecks.notNull(x, "x");
        int n = y.length;
        int k = x.length;
        for (int j = 0; j < k; j++) {
            AnalyticsChecks.finiteValues(x[j], "x[" + j + "]");
            if (x[j].length != n) {
                throw new IllegalArgumentException("regressor " + j + " has " + x[j].length + " rows, y has " + n);
            }
        }
        if (weights != null) {
            AnalyticsChecks.finiteValues(weights, "weights");
            if (weights.length != n) {
                throw new IllegalArgumentException("weights have " + weights.length + " rows, y has " + n);
            }
            for (double w : weights) {
                if (!(w > 0)) {
                    throw new IllegalArgumentException("weights must be positive, got " + w);
                }
            }
        }
        if (n <= k + 1) {
            return null;
        }
        double[][] design = new double[k + 1][n];
        double[] scaledY = new double[n];
        for (int i = 0; i < n; i++) {
            double s = weights == null ? 1.0 : Math.sqrt(weights[i]);
            design[0][i] = s;
            scaledY[i] = s * y[i];
            for (int j = 0; j < k; j++) {
                design[j + 1][i] = s * x[j][i];
            }
        }
        double[][] copy = new double[k + 1][];
        for (int j = 0; j <= k; j++) {
            copy[j] = design[j].clone();
        }
        HouseholderQr qr = new HouseholderQr(copy, n);
        if (!qr.isFullRank()) {
            return null;
        }
        double[] g = qr.solve(scaledY, new double[n]);
        double sumW = 0.0;
        double sumWy = 0.0;
        for (int i = 0; i < n; i++) {
            double w = weights == null ? 1.0 : weights[i];
            sumW += w;
            sumWy += w * y[i];
        }
        double mean = sumWy / sumW;
        double ssr = 0.0;
        double sst = 0.0;
        for (int i = 0; i < n; i++) {
            double w = weights == null ? 1.0 : weights[i];
            double fitted = g[0];
            for (int j = 0; j < k; j++) {
                fitted += g[j + 1] * x[j][i];
            }
            double u = y[i] - fitted;
            ssr += w * u * u;
            sst += w * (y[i] - mean) * (y[i] - mean);
        }
        return new CrossSectionRegression(g, sst > 0 ? 1.0 - ssr / sst : Double.NaN);
    }

    /**
     * z-scores of a column over the sample: (x_i - mean) / s with the equal-weighted mean and s the standard deviation
     * with divisor n - 1; null when n &lt; 2 or s is 0 (the column cannot be standardised).
     */
    public static double[] standardize(double[] x) {
        AnalyticsChecks.finiteValues(x, "x");
        int n = x.length;
        if (n < 2) {
            return null;
        }
        double mean = WindowMoments.mean(x, 0, n);
        double ss = 0.0;
        for (double v : x) {
            ss += (v - mean) * (v - mean);
        }
        double s = Math.sqrt(ss / (n - 1));
        if (!(s > 0)) {
            return null;
        }
        double[] z = new double[n];
        for (int i = 0; i < n; i++) {
            z[i] = (x[i] - mean) / s;
        }
        return z;
    }
}
