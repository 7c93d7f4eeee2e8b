package dev.winnow.stats;

import java.util.Arrays;
import java.util.List;

/**
 * Computes a {@link CorrelationMatrix}. All series are laid on the union of their dates once (a merge, no hashing).
 * <ul>
 *   <li>Both series of a pair cover every union date: their deviations from a fixed shift (Pearson: the series mean;
 *       Spearman: the mean rank (n+1)/2 of whole-series ranks) and the per-series sums are precomputed, so the pair
 *       costs one dot product.</li>
 *   <li>Otherwise one pass over the union sums deviations over the dates both have ({@link ShiftedSums}); Spearman
 *       first re-ranks the common observations of each side in linear time from the series' sort order, and shifts by
 *       the exact mean rank (m+1)/2.</li>
 * </ul>
 */
final class PairwiseMatrix {

    private final boolean spearman;
    private final int unionSize;
    private final double[][] dense;
    private final int[][] positions;
    private final double[][] values;
    private final double[] means;
    private final int[][] sortOrders;
    private final double[] ranksX;
    private final double[] ranksY;
    private final double[][] fullDeviations;
    private final double[] fullSums;
    private final double[] fullSumsOfSquares;
    private final boolean[] fullVaries;
    private int lastCount;

    PairwiseMatrix(List<ReturnSeries> series, Correlations.Method method) {
        DateAlignment.Union union = DateAlignment.union(series);
        this.spearman = method == Correlations.Method.SPEARMAN;
        this.unionSize = union.size();
        this.dense = union.dense();
        this.positions = union.positions();
        int k = series.size();
        this.values = new double[k][];
        this.means = new double[k];
        this.sortOrders = new int[k][];
        this.fullDeviations = new double[k][];
        this.fullSums = new double[k];
        this.fullSumsOfSquares = new double[k];
        this.fullVaries = new boolean[k];
        for (int i = 0; i < k; i++) {
            values[i] = series.get(i).values();
            means[i] = WindowMoments.mean(values[i], 0, values[i].length);
            if (isFull(i)) {
                double[] scores = values[i];
                double shift = means[i];
                if (spearman) {
                    scores = Ranks.averageRanks(values[i], values[i].length);
                    shift = (unionSize + 1) / 2.0;
                }
                fullDeviations[i] = new double[unionSize];
                WindowMoments.centre(scores, 0, unionSize, shift, fullDeviations[i]);
                fullSums[i] = sum(fullDeviations[i]);
                fullSumsOfSquares[i] = WindowMoments.sumOfSquares(fullDeviations[i], unionSize);
                fullVaries[i] = !WindowMoments.isConstant(scores, 0, unionSize);
            }
        }
        this.ranksX = spearman ? new double[unionSize] : null;
        this.ranksY = spearman ? new double[unionSize] : null;
    }

    CorrelationMatrix compute() {
        int k = values.length;
        double[][] matrix = new double[k][k];
        int[][] observations = new int[k][k];
        for (int i = 0; i < k; i++) {
            int n = values[i].length;
            observations[i][i] = n;
            matrix[i][i] = n >= Correlations.MIN_OBSERVATIONS && !WindowMoments.isConstant(values[i], 0, n) ? 1.0 : Double.NaN;
            for (int j = i + 1; j < k; j++) {
                double r;
                if (isFull(i) && isFull(j)) {
                    r = correlateFull(i, j);
                } else if (spearman) {
                    r = spearmanPair(i, j);
                } else {
                    r = correlateCommon(dense[i], means[i], dense[j], means[j]);
                }
                matrix[i][j] = matrix[j][i] = r;
                observations[i][j] = observations[j][i] = lastCount;
            }
        }
        return new CorrelationMatrix(matrix, observations);
    }

    private boolean isFull(int i) {
        return values[i].length == unionSize;
    }

    /** Both series cover every union date: only the cross sum depends on the pair. */
    private double correlateFull(int i, int j) {
        lastCount = unionSize;
        if (unionSize < Correlations.MIN_OBSERVATIONS || !fullVaries[i] || !fullVaries[j]) {
            return Double.NaN;
        }
        double cross = dot(fullDeviations[i], fullDeviations[j]);
        return ShiftedSums.correlation(unionSize, fullSums[i], fullSums[j], fullSumsOfSquares[i], fullSumsOfSquares[j], cross);
    }

    /** Spearman for a pair with gaps: re-rank the common observations of each side. */
    private double spearmanPair(int i, int j) {
        Arrays.fill(ranksX, Double.NaN);
        Arrays.fill(ranksY, Double.NaN);
        int common = Ranks.ranksAmongCommon(sortOrder(i), values[i], positions[i], dense[j], ranksX);
        Ranks.ranksAmongCommon(sortOrder(j), values[j], positions[j], dense[i], ranksY);
        double meanRank = (common + 1) / 2.0;
        return correlateCommon(ranksX, meanRank, ranksY, meanRank);
    }

    private static double sum(double[] x) {
        double sum = 0.0;
        for (double v : x) {
            sum += v;
        }
        return sum;
    }

    /** Dot product with four partial sums, which lets the processor overlap the additions. */
    private static double dot(double[] a, double[] b) {
        double s0 = 0.0;
        double s1 = 0.0;
        double s2 = 0.0;
        double s3 = 0.0;
        int n = a.length;
        int u = 0;
        for (; u + 3 < n; u += 4) {
            s0 += a[u] * b[u];
            s1 += a[u + 1] * b[u + 1];
            s2 += a[u + 2] * b[u + 2];
            s3 += a[u + 3] * b[u + 3];
        }
        for (; u < n; u++) {
            s0 += a[u] * b[u];
        }
        return (s0 + s1) + (s2 + s3);
    }

    private int[] sortOrder(int i) {
        if (sortOrders[i] == null) {
            sortOrders[i] = Ranks.sortedOrder(values[i]);
        }
        return sortOrders[i];
    }

    /** Correlation over the union positions where both a and b hold a number; sets {@link #lastCount}. */
    private double correlateCommon(double[] a, double shiftA, double[] b, double shiftB) {
        ShiftedSums sums = ShiftedSums.over(a, shiftA, b, shiftB, unionSize);
        lastCount = sums.count();
        return sums.correlation();
    }
}
