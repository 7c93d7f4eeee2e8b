package dev.winnow.stats;

/**
 * Pairwise correlations of several series, in input order; see {@link Correlations#matrix}.
 *
 * @param matrix       correlation of series i and j over the dates both have (NaN when undefined)
 * @param observations number of dates both have (the series' own count on the diagonal)
 */
public record CorrelationMatrix(double[][] matrix, int[][] observations) {

    public CorrelationMatrix {
        matrix = deepCopy(AnalyticsChecks.notNull(matrix, "matrix"));
        observations = deepCopy(AnalyticsChecks.notNull(observations, "observations"));
    }

    @Override
    public double[][] matrix() {
        return deepCopy(matrix);
    }

    @Override
    public int[][] observations() {
        return deepCopy(observations);
    }

    public int size() {
        return matrix.length;
    }

    public double correlation(int i, int j) {
        return matrix[i][j];
    }

    public int observations(int i, int j) {
        return observations[i][j];
    }

    private static double[][] deepCopy(double[][] rows) {
        double[][] copy = new double[rows.length][];
        for (int i = 0; i < rows.length; i++) {
            copy[i] = rows[i].clone();
        }
        return copy;
    }

    private static int[][] deepCopy(int[][] rows) {
        int[][] copy = new int[rows.length][];
        for (int i = 0; i < rows.length; i++) {
            copy[i] = rows[i].clone();
        }
        return copy;
    }
}
