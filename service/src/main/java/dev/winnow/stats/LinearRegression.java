package dev.winnow.stats;

import java.util.Arrays;

/**
 * Ordinary least squares with intercept, y_t = alpha + sum_j beta_j x_tj + u_t, solved by a
 * Householder QR factorisation of the design matrix [1, X] (never by forming X'X), so that
 * ill-conditioned designs such as the NIST StRD Longley problem keep their accuracy.
 *
 * <p>Regressors are passed as columns: {@code xColumns[j][t]} is regressor j at row t, and
 * {@code y[t]} the response. NaN marks a missing value: a row with a NaN in y or in any regressor
 * is dropped. Infinite values are rejected.
 *
 * <p>To regress many responses on the same regressors (security loadings on a common factor set),
 * build a {@link Design} once: it keeps the factorisation and reuses it for every response whose
 * missing rows are a subset of the regressors' missing rows, and refits from scratch otherwise.
 */
public final class LinearRegression {

    private LinearRegression() {
    }

    /** Fits y on the regressor columns plus an intercept; see the class comment for missing values. */
    public static RegressionResult fit(double[][] xColumns, double[] y) {
        checkInputs(xColumns, y);
        return fitChecked(xColumns, y).result();
    }

    /**
     * Prepares repeated fits of different responses on the same regressor columns.
     *
     * @throws IllegalArgumentException when there is no regressor column (use {@link #fit} for an
     *                                  intercept-only fit) or the columns differ in length or hold an infinity
     */
    public static Design design(double[][] xColumns) {
        if (xColumns == null || xColumns.length == 0) {
            throw new IllegalArgumentException("a design needs at least one regressor column; use fit(...) for an intercept-only fit");
        }
        int rows = lengthOf(xColumns[0], "regressor column 0");
        checkInputs(xColumns, new double[rows]);
        return new Design(xColumns, rows);
    }

    /**
     * Newey-West (1987, Econometrica 55(3)) heteroskedasticity and autocorrelation consistent standard
     * error of the intercept, with Bartlett weights and no small-sample correction:
     * <pre>
     * V = (X'X)^-1 [ sum_t u_t^2 x_t x_t' + sum_{l=1..L} w_l sum_t u_t u_{t-l} (x_t x_{t-l}' + x_{t-l} x_t') ] (X'X)^-1,
     * w_l = 1 - l / (L + 1),
     * </pre>
     * where x_t is row t of [1, X], u_t the OLS residual and L = {@code lags}; the result is
     * sqrt(V[0][0]). Rows with a NaN are dropped first and lags count the remaining rows in order
     * (as a spanning regression of aligned return series expects).
     *
     * @return the standard error, or NaN when the fit is not identified or leaves no residual degrees of freedom
     * @throws IllegalArgumentException when lags is negative or the inputs are malformed
     */
    public static double neweyWestAlphaStandardError(double[][] xColumns, double[] y, int lags) {
        checkHacInputs(xColumns, y, lags);
        return hacInterceptStandardError(fitChecked(xColumns, y), lags);
    }

    /**
     * Intercept divided by its {@link #neweyWestAlphaStandardError Newey-West standard error}.
     *
     * @return the t-statistic, or NaN when the fit is not identified or leaves no residual degrees of freedom
     */
    public static double neweyWestAlphaT(double[][] xColumns, double[] y, int lags) {
        checkHacInputs(xColumns, y, lags);
        OlsFit fit = fitChecked(xColumns, y);
        return fit.result().alpha() / hacInterceptStandardError(fit, lags);
    }

    private static void checkHacInputs(double[][] xColumns, double[] y, int lags) {
        checkInputs(xColumns, y);
        if (lags < 0) {
            throw new IllegalArgumentException("Newey-West lags must be >= 0, got " + lags);
        }
    }

    /** sqrt(a' S a) with a = (X'X)^-1 e_0, i.e. scores h_t = u_t a'x_t fed to the Bartlett sum. */
    private static double hacInterceptStandardError(OlsFit fit, int lags) {
        double[][] design = fit.design();
        double[] u = fit.compactResiduals();
        if (fit.inverseGram() == null || u.length <= design.length) {
            return Double.NaN;
        }
        double[] interceptRow = fit.inverseGram()[0];
        double[] scores = new double[u.length];
        for (int t = 0; t < u.length; t++) {
            double projection = 0.0;
            for (int m = 0; m < design.length; m++) {
                projection += interceptRow[m] * design[m][t];
            }
            scores[t] = u[t] * projection;
        }
        return Math.sqrt(bartlettLongRunSum(scores, lags));
    }

    /**
     * sum_t h_t^2 + 2 sum_{l=1..L} (1 - l/(L+1)) sum_{t>=l} h_t h_{t-l}: the Bartlett-weighted
     * long-run sum of a score series (not demeaned: OLS scores have mean zero by construction).
     */
    private static double bartlettLongRunSum(double[] h, int lags) {
        double sum = 0.0;
        for (double v : h) {
            sum += v * v;
        }
        for (int l = 1; l <= Math.min(lags, h.length - 1); l++) {
            double weight = 1.0 - l / (lags + 1.0);
            double cross = 0.0;
            for (int t = l; t < h.length; t++) {
                cross += h[t] * h[t - l];
            }
            sum += 2.0 * weight * cross;
        }
        return sum;
    }

    /** Repeated fits against fixed regressors; immutable and safe to share between threads. */
    public static final class Design {
        private final double[][] xColumns;
        private final int rows;
        private final int[] usedRows;
        private final double[][] compactDesign;
        private final HouseholderQr qr;
        private final double[][] inverseGram;

        private Design(double[][] xColumns, int rows) {
            this.xColumns = deepCopy(xColumns);
            this.rows = rows;
            this.usedRows = completeRows(this.xColumns, null);
            this.compactDesign = compactDesign(this.xColumns, usedRows);
            this.qr = new HouseholderQr(deepCopy(compactDesign), usedRows.length);
            this.inverseGram = qr.isFullRank() ? qr.inverseGram() : null;
        }

        /** Same result as {@link LinearRegression#fit(double[][], double[])} on the design's regressors. */
        public RegressionResult fit(double[] y) {
            if (y == null || y.length != rows) {
                throw new IllegalArgumentException("response must have " + rows + " rows like the design, got "
                        + (y == null ? "null" : y.length));
            }
            double[] compactY = new double[usedRows.length];
            for (int i = 0; i < usedRows.length; i++) {
                double value = y[usedRows[i]];
                if (!Double.isFinite(value)) {
                    return LinearRegression.fit(xColumns, y);
                }
                compactY[i] = value;
            }
            return summarise(compactDesign, qr, inverseGram, compactY, usedRows, rows).result();
        }
    }

    private record OlsFit(double[][] design, double[][] inverseGram, double[] compactResiduals, RegressionResult result) {
    }

    private static OlsFit fitChecked(double[][] xColumns, double[] y) {
        int[] usedRows = completeRows(xColumns, y);
        double[][] design = compactDesign(xColumns, usedRows);
        HouseholderQr qr = new HouseholderQr(deepCopy(design), usedRows.length);
        double[][] inverseGram = qr.isFullRank() ? qr.inverseGram() : null;
        double[] compactY = new double[usedRows.length];
        for (int i = 0; i < usedRows.length; i++) {
            compactY[i] = y[usedRows[i]];
        }
        return summarise(design, qr, inverseGram, compactY, usedRows, y.length);
    }

    private static OlsFit summarise(double[][] design, HouseholderQr qr, double[][] inverseGram,
                                    double[] y, int[] usedRows, int totalRows) {
        int n = y.length;
        int p = design.length;
        int k = p - 1;
        double[] residuals = new double[totalRows];
        Arrays.fill(residuals, Double.NaN);
        if (!qr.isFullRank()) {
            double[] nanBetas = new double[k];
            double[] nanErrors = new double[p];
            Arrays.fill(nanBetas, Double.NaN);
            Arrays.fill(nanErrors, Double.NaN);
            return new OlsFit(design, null, new double[0],
                    new RegressionResult(n, k, Double.NaN, nanBetas, nanErrors, Double.NaN, Double.NaN, residuals));
        }
        double[] work = new double[n];
        double[] coefficients = qr.solve(y, work);
        double mean = 0.0;
        for (double v : y) {
            mean += v;
        }
        mean /= n;
        double[] compactResiduals = work;
        double ssr = 0.0;
        double sst = 0.0;
        for (int t = 0; t < n; t++) {
            double fitted = 0.0;
            for (int m = 0; m < p; m++) {
                fitted += coefficients[m] * design[m][t];
            }
            double u = y[t] - fitted;
            compactResiduals[t] = u;
            residuals[usedRows[t]] = u;
            ssr += u * u;
            sst += (y[t] - mean) * (y[t] - mean);
        }
        int dof = n - p;
        double variance = dof > 0 ? ssr / dof : Double.NaN;
        double[] standardErrors = new double[p];
        for (int m = 0; m < p; m++) {
            standardErrors[m] = Math.sqrt(variance * inverseGram[m][m]);
        }
        double rSquared = sst > 0.0 ? 1.0 - ssr / sst : Double.NaN;
        RegressionResult result = new RegressionResult(n, k, coefficients[0], Arrays.copyOfRange(coefficients, 1, p),
                standardErrors, rSquared, Math.sqrt(variance), residuals);
        return new OlsFit(design, inverseGram, compactResiduals, result);
    }

    /** Indices of rows where y (when given) and every regressor are present. */
    private static int[] completeRows(double[][] xColumns, double[] y) {
        int rows = y != null ? y.length : xColumns[0].length;
        int[] used = new int[rows];
        int count = 0;
        for (int t = 0; t < rows; t++) {
            boolean complete = y == null || !Double.isNaN(y[t]);
            for (int j = 0; j < xColumns.length && complete; j++) {
                complete = !Double.isNaN(xColumns[j][t]);
            }
            if (complete) {
                used[count++] = t;
            }
        }
        return Arrays.copyOf(used, count);
    }

    /** Columns [1, x_1, ..., x_k] restricted to the used rows. */
    private static double[][] compactDesign(double[][] xColumns, int[] usedRows) {
        double[][] design = new double[xColumns.length + 1][usedRows.length];
        Arrays.fill(design[0], 1.0);
        for (int j = 0; j < xColumns.length; j++) {
            double[] source = xColumns[j];
            double[] target = design[j + 1];
            for (int i = 0; i < usedRows.length; i++) {
                target[i] = source[usedRows[i]];
            }
        }
        return design;
    }

    private static double[][] deepCopy(double[][] columns) {
        double[][] copy = new double[columns.length][];
        for (int j = 0; j < columns.length; j++) {
            copy[j] = columns[j].clone();
        }
        return copy;
    }

    private static void checkInputs(double[][] xColumns, double[] y) {
        if (xColumns == null) {
            throw new IllegalArgumentException("regressor columns must not be null; pass an empty array for an intercept-only fit");
        }
        int rows = lengthOf(y, "response y");
        checkNoInfinity(y, "response y");
        for (int j = 0; j < xColumns.length; j++) {
            String name = "regressor column " + j;
            if (lengthOf(xColumns[j], name) != rows) {
                throw new IllegalArgumentException(name + " has " + xColumns[j].length + " rows but y has " + rows);
            }
            checkNoInfinity(xColumns[j], name);
        }
    }

    private static int lengthOf(double[] values, String name) {
        if (values == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        return values.length;
    }

    private static void checkNoInfinity(double[] values, String name) {
        for (int t = 0; t < values.length; t++) {
            if (Double.isInfinite(values[t])) {
                throw new IllegalArgumentException(name + " is infinite at row " + t + "; use NaN to mark a missing value");
            }
        }
    }
}
