package dev.winnow.stats;

/**
 * Allocation-free building blocks over a slice x[from..from+n) shared by the one-shot and the rolling
 * statistics, so that both give the same numbers for the same observations.
 */
final class WindowMoments {

    private WindowMoments() {
    }

    /** Arithmetic mean, summed in index order. */
    static double mean(double[] x, int from, int n) {
        double sum = 0.0;
        for (int i = from; i < from + n; i++) {
            sum += x[i];
        }
        return sum / n;
    }

    /** True when every value equals the first: the variance is exactly zero. */
    static boolean isConstant(double[] x, int from, int n) {
        for (int i = from + 1; i < from + n; i++) {
            if (x[i] != x[from]) {
                return false;
            }
        }
        return true;
    }

    /** Writes e[i] = x[from+i] - centre for i in [0, n). */
    static void centre(double[] x, int from, int n, double centre, double[] e) {
        for (int i = 0; i < n; i++) {
            e[i] = x[from + i] - centre;
        }
    }

    /** Sum of e[i]^2 for i in [0, n). */
    static double sumOfSquares(double[] e, int n) {
        double sum = 0.0;
        for (int i = 0; i < n; i++) {
            sum += e[i] * e[i];
        }
        return sum;
    }

    /** Sample standard deviation sqrt(sum e^2 / (n-1)); exactly 0 for a constant sample; NaN for n < 2. */
    static double sampleStdev(double sumOfSquares, int n, boolean constant) {
        if (n < 2) {
            return Double.NaN;
        }
        return constant ? 0.0 : Math.sqrt(sumOfSquares / (n - 1));
    }

    /** Classical t-statistic of the mean, mean / (stdev / sqrt n); NaN when stdev is 0 or undefined. */
    static double tStat(double mean, double stdev, int n) {
        return stdev > 0.0 ? mean / (stdev / Math.sqrt(n)) : Double.NaN;
    }

    /** Annualised Sharpe ratio mean / stdev * sqrt(periodsPerYear); NaN when stdev is 0 or undefined. */
    static double sharpeAnnual(double mean, double stdev, int periodsPerYear) {
        return stdev > 0.0 ? mean / stdev * Math.sqrt(periodsPerYear) : Double.NaN;
    }
}
