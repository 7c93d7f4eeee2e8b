package dev.winnow.stats;

/**
 * Householder QR factorisation of a tall n x p matrix given as p columns of length n (Golub and
 * Van Loan, Matrix Computations, section 5.2), used to solve least squares without forming X'X.
 * Columns are first scaled to unit Euclidean norm, which leaves the least-squares fit unchanged and
 * makes the rank test scale-free.
 *
 * <p>Once built the factorisation is only read, so {@link #solve} and {@link #inverseGram} may run
 * concurrently.
 */
final class HouseholderQr {

    /** A scaled column whose remaining norm falls below this is treated as linearly dependent. */
    private static final double RANK_TOLERANCE = 1e-12;

    private final int rows;
    private final int cols;
    /** Column j holds the Householder vector of step j in rows j..n-1 and R's column j above row j. */
    private final double[][] factors;
    private final double[] rDiagonal;
    private final double[] columnScale;
    private final boolean fullRank;

    /** Factorises the given columns; takes ownership of the arrays (they are overwritten). */
    HouseholderQr(double[][] columnsToOverwrite, int rows) {
        this.rows = rows;
        this.cols = columnsToOverwrite.length;
        this.factors = columnsToOverwrite;
        this.rDiagonal = new double[cols];
        this.columnScale = new double[cols];
        boolean independent = rows >= cols;
        for (int j = 0; j < cols; j++) {
            double norm = norm(factors[j], 0);
            columnScale[j] = norm;
            if (norm > 0.0) {
                double[] column = factors[j];
                for (int i = 0; i < rows; i++) {
                    column[i] /= norm;
                }
            } else {
                independent = false;
            }
        }
        for (int k = 0; k < cols && independent; k++) {
            independent = reflect(k);
        }
        this.fullRank = independent;
    }

    private boolean reflect(int k) {
        double[] v = factors[k];
        double norm = norm(v, k);
        if (norm <= RANK_TOLERANCE) {
            return false;
        }
        if (v[k] < 0) {
            norm = -norm;
        }
        for (int i = k; i < rows; i++) {
            v[i] /= norm;
        }
        v[k] += 1.0;
        for (int j = k + 1; j < cols; j++) {
            applyReflector(k, factors[j]);
        }
        rDiagonal[k] = -norm;
        return true;
    }

    /** Overwrites {@code target} with H_k target, H_k = I - v v' / v_k (v normalised as in JAMA). */
    private void applyReflector(int k, double[] target) {
        double[] v = factors[k];
        double s = 0.0;
        for (int i = k; i < rows; i++) {
            s += v[i] * target[i];
        }
        s = -s / v[k];
        for (int i = k; i < rows; i++) {
            target[i] += s * v[i];
        }
    }

    private double norm(double[] column, int from) {
        double scale = 0.0;
        for (int i = from; i < rows; i++) {
            scale = Math.max(scale, Math.abs(column[i]));
        }
        if (scale == 0.0) {
            return 0.0;
        }
        double sum = 0.0;
        for (int i = from; i < rows; i++) {
            double x = column[i] / scale;
            sum += x * x;
        }
        return scale * Math.sqrt(sum);
    }

    boolean isFullRank() {
        return fullRank;
    }

    /**
     * Least-squares coefficients in the original column units. {@code work} (length n) receives a
     * copy of y and is overwritten; the caller owns it so repeated solves allocate nothing else.
     */
    double[] solve(double[] y, double[] work) {
        System.arraycopy(y, 0, work, 0, rows);
        for (int k = 0; k < cols; k++) {
            applyReflector(k, work);
        }
        double[] coefficients = new double[cols];
        for (int k = cols - 1; k >= 0; k--) {
            double s = work[k];
            for (int j = k + 1; j < cols; j++) {
                s -= factors[j][k] * coefficients[j];
            }
            coefficients[k] = s / rDiagonal[k];
        }
        for (int j = 0; j < cols; j++) {
            coefficients[j] /= columnScale[j];
        }
        return coefficients;
    }

    /** (X'X)^-1 in the original column units, from R^-1 R^-T of the scaled problem. */
    double[][] inverseGram() {
        double[][] rInverse = new double[cols][cols];
        for (int k = cols - 1; k >= 0; k--) {
            rInverse[k][k] = 1.0 / rDiagonal[k];
            for (int j = k + 1; j < cols; j++) {
                double s = 0.0;
                for (int m = k + 1; m <= j; m++) {
                    s += factors[m][k] * rInverse[m][j];
                }
                rInverse[k][j] = -s / rDiagonal[k];
            }
        }
        double[][] inverse = new double[cols][cols];
        for (int a = 0; a < cols; a++) {
            for (int b = a; b < cols; b++) {
                double s = 0.0;
                for (int m = b; m < cols; m++) {
                    s += rInverse[a][m] * rInverse[b][m];
                }
                s /= columnScale[a] * columnScale[b];
                inverse[a][b] = s;
                inverse[b][a] = s;
            }
        }
        return inverse;
    }
}
