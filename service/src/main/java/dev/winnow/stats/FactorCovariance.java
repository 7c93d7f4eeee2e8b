package dev.winnow.stats;

/**
 * Weighted factor covariance matrix with an optional Newey-West adjustment for serial correlation.
 *
 * <p>Observations x_1..x_n (oldest first), each a vector of K factor returns. Weights: equal, w_t = 1/n; or, with a
 * half-life H, the raw weight of an observation of age a = n - t (0 for the latest) is 0.5^(a/H), and the weights
 * are normalised to sum to 1. Then
 * <pre>
 * m   = sum_t w_t x_t
 * c   = 1 / (1 - sum_t w_t^2)
 * C_0 = c sum_{t=1..n} w_t (x_t - m)(x_t - m)'
 * C_l = c sum_{t=l+1..n} w_t (x_t - m)(x_{t-l} - m)'          (l = 1..L)
 * V   = C_0 + sum_{l=1..L} (1 - l/(L+1)) (C_l + C_l')
 * </pre>
 * With equal weights c = n/(n-1) and C_0 is the sample covariance with divisor n-1; c is the usual bias correction
 * for reliability weights (the "unbiased weighted covariance", as numpy {@code cov(aweights=...)} documents it). The
 * lag terms with Bartlett weights 1 - l/(L+1) are those of Newey and West (1987), "A Simple, Positive
 * Semi-Definite, Heteroskedasticity and Autocorrelation Consistent Covariance Matrix", Econometrica 55(3),
 * 703-708. Exponential weighting by a half-life and the serial-correlation adjustment of factor covariances are
 * common practice in risk models.
 */
public final class FactorCovariance {

    private FactorCovariance() {
    }

    /**
     * The estimate, per period (not annualised).
     *
     * @param covariance  V, K x K, symmetric
     * @param volatility  sqrt(V_kk); NaN where V_kk is not positive
     * @param correlation V_ij / (vol_i vol_j), 1 on the diagonal; NaN where a volatility is not positive
     */
    public record Estimate(double[][] covariance, double[] volatility, double[][] correlation) {

        /** The same estimate with the covariance multiplied by {@code periodsPerYear} (volatility by its root). */
        public Estimate annualized(int periodsPerYear) {
            AnalyticsChecks.atLeast(periodsPerYear, 1, "periodsPerYear");
            int k = covariance.length;
            double[][] scaled = new double[k][k];
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    scaled[i][j] = covariance[i][j] * periodsPerYear;
                }
            }
            return fromCovariance(scaled);
        }
    }

    /**
     * Weights w_1..w_n: 1/n each when {@code halfLife} is null, else 0.5^((n - t)/H) normalised to sum to 1.
     *
     * @param halfLife null for equal weights, else a positive finite number of periods
     */
    public static double[] weights(int n, Double halfLife) {
        AnalyticsChecks.atLeast(n, 1, "n");
        double[] w = new double[n];
        if (halfLife == null) {
            java.util.Arrays.fill(w, 1.0 / n);
            return w;
        }
        if (!(halfLife > 0) || Double.isInfinite(halfLife)) {
            throw new IllegalArgumentException("halfLife must be a positive finite number of periods, got " + halfLife);
        }
        double sum = 0.0;
        for (int t = 0; t < n; t++) {
            int age = n - 1 - t;
            w[t] = Math.pow(0.5, age / halfLife);
            sum += w[t];
        }
        for (int t = 0; t < n; t++) {
            w[t] /= sum;
        }
        return w;
    }

    /**
     * The covariance estimate of the class comment.
     *
     * @param x        {@code x[t][k]}: the return of factor k at observation t, oldest first, all finite; n >= 2
     * @param halfLife null for equal weights, else the half-life in periods
     * @param lags     L, the Newey-West lags, 0..n-1
     */
    public static Estimate estimate(double[][] x, Double halfLife, int lags) {
        AnalyticsChecks.notNull(x, "x");
        int n = x.length;
        AnalyticsChecks.atLeast(n, 2, "observations");
        int k = x[0].length;
        AnalyticsChecks.atLeast(k, 1, "factors");
        for (int t = 0; t < n; t++) {
            if (x[t].length != k) {
                throw new IllegalArgumentException("observation " + t + " has " + x[t].length + " returns; expected " + k);
            }
            AnalyticsChecks.finiteValues(x[t], "x[" + t + "]");
        }
        if (lags < 0 || lags >= n) {
            throw new IllegalArgumentException("lags must be from 0 to n-1 = " + (n - 1) + ", got " + lags);
        }
        double[] w = weights(n, halfLife);
        double sumSquares = 0.0;
        double[] mean = new double[k];
        for (int t = 0; t < n; t++) {
            sumSquares += w[t] * w[t];
            for (int j = 0; j < k; j++) {
                mean[j] += w[t] * x[t][j];
            }
        }
        double c = 1.0 / (1.0 - sumSquares);
        double[][] d = new double[n][k];
        for (int t = 0; t < n; t++) {
            for (int j = 0; j < k; j++) {
                d[t][j] = x[t][j] - mean[j];
            }
        }
        double[][] v = lagged(d, w, 0, c);
        for (int l = 1; l <= lags; l++) {
            double bartlett = 1.0 - l / (lags + 1.0);
            double[][] cl = lagged(d, w, l, c);
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    v[i][j] += bartlett * (cl[i][j] + cl[j][i]);
                }
            }
        }
        // V is symmetric in exact arithmetic; copy the upper triangle so that rounding cannot make it asymmetric
        for (int i = 0; i < k; i++) {
            for (int j = i + 1; j < k; j++) {
                v[j][i] = v[i][j];
            }
        }
        return fromCovariance(v);
    }

    /** C_l = c sum_{t=l+1..n} w_t d_t d_{t-l}'. */
    private static double[][] lagged(double[][] d, double[] w, int l, double c) {
        int n = d.length;
        int k = d[0].length;
        double[][] out = new double[k][k];
        for (int t = l; t < n; t++) {
            double wt = w[t];
            double[] now = d[t];
            double[] before = d[t - l];
            for (int i = 0; i < k; i++) {
                double a = wt * now[i];
                double[] row = out[i];
                for (int j = 0; j < k; j++) {
                    row[j] += a * before[j];
                }
            }
        }
        for (double[] row : out) {
            for (int j = 0; j < k; j++) {
                row[j] *= c;
            }
        }
        return out;
    }

    private static Estimate fromCovariance(double[][] v) {
        int k = v.length;
        double[] vol = new double[k];
        for (int i = 0; i < k; i++) {
            vol[i] = v[i][i] > 0 ? Math.sqrt(v[i][i]) : Double.NaN;
        }
        double[][] corr = new double[k][k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                corr[i][j] = i == j ? (Double.isNaN(vol[i]) ? Double.NaN : 1.0) : v[i][j] / (vol[i] * vol[j]);
            }
        }
        return new Estimate(v, vol, corr);
    }
}
