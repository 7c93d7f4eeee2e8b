package dev.winnow.stats;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.DecompositionSolver;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.special.Beta;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * Time-series tests of a factor model on test assets. Each asset's excess return is regressed, with intercept, on the
 * L factors over the same T periods by ordinary least squares ({@link LinearRegression}):
 * r_it = a_i + sum_l b_il f_lt + e_it.
 * <ul>
 *   <li>alpha_t = a_i / its OLS standard error; alpha_nw_t = a_i / its Newey and West (1987, Econometrica 55(3))
 *       standard error (Bartlett weights, L_nw = floor(4 (T/100)^(2/9)) lags, no small-sample correction, as
 *       statsmodels' HAC covariance with use_correction=False);</li>
 *   <li>residual_vol = sqrt(SSR / (T - L - 1)); r_squared = 1 - SSR / SST;</li>
 *   <li>the test of Gibbons, Ross and Shanken (1989, "A Test of the Efficiency of a Given Portfolio", Econometrica
 *       57(5), 1121-1152) that every a_i is zero, in the form of Campbell, Lo and MacKinlay (1997, The Econometrics of
 *       Financial Markets, chapter 6):
 *       GRS = ((T - N - L) / N) (a' S^-1 a) / (1 + mu' O^-1 mu), with S = E'E / T the residual covariance and
 *       O = (1/T) sum_t (f_t - mu)(f_t - mu)' the factor covariance (both maximum likelihood), mu the factor means;
 *       under normal errors GRS ~ F(N, T - N - L), and p_value = P(F &gt; GRS) =
 *       I_{d2 / (d2 + d1 GRS)}(d2 / 2, d1 / 2), the regularised incomplete beta function (Abramowitz and Stegun
 *       26.6.2) with d1 = N, d2 = T - N - L.</li>
 * </ul>
 * The inverses are solved on the matrices scaled to unit diagonal (correlation form), so that singularity is judged
 * independently of the return units; a singular matrix is an {@link IllegalArgumentException} saying which.
 */
public final class FactorModelTest {
    /** Pivot threshold of the LU solve on a unit-diagonal matrix. */
    private static final double SINGULARITY = 1e-10;

    private FactorModelTest() {
    }

    /** One asset's time-series regression. */
    public record AssetRegression(double alpha, double alphaT, double alphaNwT, double[] betas, double rSquared,
                                  double residualVol) {
        public AssetRegression {
            betas = betas.clone();
        }

        @Override
        public double[] betas() {
            return betas.clone();
        }
    }

    /**
     * @param months        T
     * @param nwLags        Newey-West lags used for alpha_nw_t
     * @param grs           the GRS statistic
     * @param pValue        P(F(N, T-N-L) &gt; GRS)
     * @param meanAbsAlpha  sum |a_i| / N
     * @param meanRSquared  sum r_squared_i / N
     */
    public record Result(int months, int nwLags, double grs, double pValue, double meanAbsAlpha, double meanRSquared,
                         List<AssetRegression> regressions) {
        public Result {
            regressions = List.copyOf(regressions);
        }
    }

    /** A test on the common periods of return series: the first and last of them, and the result. */
    public record OnSeries(LocalDate first, LocalDate last, Result result) {
    }

    /**
     * The test on the dates every asset, every factor and the risk-free series (when not null) have; each asset's
     * excess return is its return minus the risk-free return of that date, factors are taken as given.
     *
     * @throws InsufficientDataException when there are not more than N + L such dates, or a covariance is singular
     */
    public static OnSeries ofSeries(List<ReturnSeries> assets, List<ReturnSeries> factors, ReturnSeries riskFree) {
        AnalyticsChecks.notNull(assets, "assets");
        AnalyticsChecks.notNull(factors, "factors");
        List<ReturnSeries> all = new ArrayList<>(assets);
        all.addAll(factors);
        if (riskFree != null) {
            all.add(riskFree);
        }
        CommonDates common = CommonDates.of(all);
        int n = assets.size();
        int l = factors.size();
        double[][] excess = new double[n][];
        for (int i = 0; i < n; i++) {
            excess[i] = common.values()[i].clone();
            if (riskFree != null) {
                double[] rf = common.values()[n + l];
                for (int t = 0; t < excess[i].length; t++) {
                    excess[i][t] -= rf[t];
                }
            }
        }
        double[][] factorColumns = new double[l][];
        for (int j = 0; j < l; j++) {
            factorColumns[j] = common.values()[n + j];
        }
        Result result = of(excess, factorColumns); // checks T > N + L first

        return new OnSeries(common.dates()[0], common.dates()[common.size() - 1], result);
    }

    /**
     * @param assets  N excess-return columns of length T (finite, aligned)
     * @param factors L factor columns of length T (finite, aligned)
     * @throws IllegalArgumentException when T &lt;= N + L, or the residual or factor covariance is singular
     */
    public static Result of(double[][] assets, double[][] factors) {
        AnalyticsChecks.notNull(assets, "assets");
        AnalyticsChecks.notNull(factors, "factors");
        int n = assets.length;
        int l = factors.length;
        if (n == 0 || l == 0) {
            throw new IllegalArgumentException("a model test needs at least one asset and one factor");
        }
        int t = factors[0].length;
        for (double[][] block : new double[][][] {assets, factors}) {
            for (double[] column : block) {
                AnalyticsChecks.finiteValues(column, "column");
                if (column.length != t) {
                    throw new IllegalArgumentException("every asset and factor column needs " + t + " periods");
                }
            }
        }
        if (t <= n + l) {
            throw new InsufficientDataException("The test of " + n + " assets on " + l + " factors needs more than N + L = "
                    + (n + l) + " common months, and there are " + t + "; widen 'from'/'to' or use fewer assets or factors.");
        }
        int lags = NeweyWest.automaticLags(t);
        double[] alphas = new double[n];
        double[][] residuals = new double[n][];
        List<AssetRegression> regressions = new ArrayList<>();
        double absAlpha = 0.0;
        double rSquared = 0.0;
        for (int i = 0; i < n; i++) {
            RegressionResult fit = LinearRegression.fit(factors, assets[i]);
            if (Double.isNaN(fit.alpha())) {
                throw new InsufficientDataException("The factors are collinear over these months (their covariance is singular); drop one of the factors.");
            }
            double nwT = LinearRegression.neweyWestAlphaT(factors, assets[i], lags);
            regressions.add(new AssetRegression(fit.alpha(), fit.alphaT(), nwT, fit.betas(), fit.rSquared(), fit.residualStdev()));
            alphas[i] = fit.alpha();
            residuals[i] = fit.residuals();
            absAlpha += Math.abs(fit.alpha());
            rSquared += fit.rSquared();
        }
        double[][] residualCov = covariance(residuals, false);
        double[] mu = new double[l];
        for (int j = 0; j < l; j++) {
            mu[j] = WindowMoments.mean(factors[j], 0, t);
        }
        double[][] factorCov = covariance(factors, true);
        double alphaForm = quadraticForm(residualCov, alphas, "The residual covariance of the assets is singular"
                + " (an asset is a combination of the others and the factors); drop one of the assets.");
        double muForm = quadraticForm(factorCov, mu, "The factor covariance is singular (a factor is constant or a"
                + " combination of the others); drop one of the factors.");
        int d2 = t - n - l;
        double grs = (d2 / (double) n) * alphaForm / (1.0 + muForm);
        double p = grs <= 0 ? 1.0 : Beta.regularizedBeta(d2 / (d2 + n * grs), d2 / 2.0, n / 2.0);
        return new Result(t, lags, grs, p, absAlpha / n, rSquared / n, regressions);
    }

    /** (1/T) sum_t (x_t - c)(x_t - c)' over the columns, c the column means when centred, else 0. */
    private static double[][] covariance(double[][] columns, boolean centred) {
        int m = columns.length;
        int t = columns[0].length;
        double[][] centredColumns = new double[m][t];
        for (int a = 0; a < m; a++) {
            double c = centred ? WindowMoments.mean(columns[a], 0, t) : 0.0;
            for (int s = 0; s < t; s++) {
                centredColumns[a][s] = columns[a][s] - c;
            }
        }
        double[][] cov = new double[m][m];
        for (int a = 0; a < m; a++) {
            for (int b = a; b < m; b++) {
                double sum = 0.0;
                for (int s = 0; s < t; s++) {
                    sum += centredColumns[a][s] * centredColumns[b][s];
                }
                cov[a][b] = sum / t;
                cov[b][a] = cov[a][b];
            }
        }
        return cov;
    }

    /** v' M^-1 v, solved on D^-1/2 M D^-1/2 (D the diagonal) so that the singularity test is scale-free. */
    private static double quadraticForm(double[][] matrix, double[] v, String singularMessage) {
        int m = v.length;
        double[] scale = new double[m];
        for (int a = 0; a < m; a++) {
            if (!(matrix[a][a] > 0)) {
                throw new InsufficientDataException(singularMessage);
            }
            scale[a] = Math.sqrt(matrix[a][a]);
        }
        double[][] unit = new double[m][m];
        double[] w = new double[m];
        for (int a = 0; a < m; a++) {
            w[a] = v[a] / scale[a];
            for (int b = 0; b < m; b++) {
                unit[a][b] = matrix[a][b] / (scale[a] * scale[b]);
            }
        }
        DecompositionSolver solver = new LUDecomposition(new Array2DRowRealMatrix(unit, false), SINGULARITY).getSolver();
        if (!solver.isNonSingular()) {
            throw new InsufficientDataException(singularMessage);
        }
        double[] x = solver.solve(new org.apache.commons.math3.linear.ArrayRealVector(w, false)).toArray();
        double form = 0.0;
        for (int a = 0; a < m; a++) {
            form += w[a] * x[a];
        }
        if (!Double.isFinite(form)) {
            throw new InsufficientDataException(singularMessage);
        }
        return form;
    }
}
