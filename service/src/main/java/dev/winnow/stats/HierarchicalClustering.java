package dev.winnow.stats;

import java.util.Arrays;

/**
 * Agglomerative clustering of series by correlation with average linkage (UPGMA, Sokal and
 * Michener 1958): the distance between two series is d = 1 - rho, and the distance between two
 * clusters A and B is the mean of d over all pairs (a in A, b in B), updated on each merge with the
 * Lance-Williams rule d(A+B, C) = (|A| d(A, C) + |B| d(B, C)) / (|A| + |B|).
 *
 * <p>Clusters are merged only while their average-linkage distance is at most 1 - threshold, that is
 * while their average correlation is at least the threshold; this is the flat cut of the average
 * linkage dendrogram at height 1 - threshold. Average linkage is reducible and its dendrogram
 * monotone, so the merges are found with the nearest-neighbour-chain algorithm (Murtagh 1983, The
 * Computer Journal 26(4)) in
 * O(n^2) time and the cut keeps every merge at height &lt;= 1 - threshold.
 */
public final class HierarchicalClustering {

    /** Slack allowed when checking that a correlation lies in [-1, 1] and the matrix is symmetric. */
    private static final double TOLERANCE = 1e-9;

    private HierarchicalClustering() {
    }

    /**
     * Flat clusters of the series behind a correlation matrix.
     *
     * @param correlation symmetric n x n matrix of correlations in [-1, 1] (the upper triangle is used); the
     *                    diagonal is ignored and a NaN correlation (pair with too little common history)
     *                    counts as distance 1, as if uncorrelated
     * @param threshold   minimum average correlation for two clusters to merge, in [-1, 1]
     * @return a label per series: clusters numbered 0, 1, ... in order of their first member
     */
    public static int[] averageLinkageClusters(double[][] correlation, double threshold) {
        int n = checkedSize(correlation);
        if (!(threshold >= -1.0 && threshold <= 1.0)) {
            throw new IllegalArgumentException("correlation threshold must lie in [-1, 1], got " + threshold);
        }
        double[][] distance = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                double rho = correlation[i][j];
                distance[i][j] = Double.isNaN(rho) ? 1.0 : 1.0 - rho;
                distance[j][i] = distance[i][j];
            }
        }
        int[] parent = new int[n];
        for (int i = 0; i < n; i++) {
            parent[i] = i;
        }
        mergeWithNearestNeighbourChain(distance, 1.0 - threshold, parent);
        return labelsInOrderOfFirstMember(parent);
    }

    /**
     * Runs the full nearest-neighbour chain. Cluster ids are the indices of their slot in
     * {@code distance}; each merge at height &lt;= cutoff is recorded in the union-find {@code parent}.
     */
    private static void mergeWithNearestNeighbourChain(double[][] distance, double cutoff, int[] parent) {
        int n = distance.length;
        boolean[] active = new boolean[n];
        Arrays.fill(active, true);
        int[] size = new int[n];
        Arrays.fill(size, 1);
        int[] chain = new int[n];
        int chainLength = 0;
        for (int remaining = n; remaining > 1; ) {
            if (chainLength == 0) {
                chain[chainLength++] = firstActive(active);
            }
            int a = chain[chainLength - 1];
            int previous = chainLength > 1 ? chain[chainLength - 2] : -1;
            int nearest = previous;
            double best = previous >= 0 ? distance[a][previous] : Double.POSITIVE_INFINITY;
            for (int c = 0; c < n; c++) {
                if (active[c] && c != a && distance[a][c] < best) {
                    best = distance[a][c];
                    nearest = c;
                }
            }
            if (nearest != previous) {
                chain[chainLength++] = nearest;
                continue;
            }
            chainLength -= 2;
            int kept = Math.min(a, previous);
            int removed = Math.max(a, previous);
            if (best <= cutoff) {
                parent[find(parent, removed)] = find(parent, kept);
            }
            for (int c = 0; c < n; c++) {
                if (active[c] && c != kept && c != removed) {
                    double merged = (size[kept] * distance[kept][c] + size[removed] * distance[removed][c])
                            / (size[kept] + size[removed]);
                    distance[kept][c] = merged;
                    distance[c][kept] = merged;
                }
            }
            size[kept] += size[removed];
            active[removed] = false;
            remaining--;
        }
    }

    private static int firstActive(boolean[] active) {
        for (int i = 0; i < active.length; i++) {
            if (active[i]) {
                return i;
            }
        }
        throw new IllegalStateException("no active cluster left");
    }

    private static int find(int[] parent, int i) {
        while (parent[i] != i) {
            parent[i] = parent[parent[i]];
            i = parent[i];
        }
        return i;
    }

    private static int[] labelsInOrderOfFirstMember(int[] parent) {
        int n = parent.length;
        int[] labelOfRoot = new int[n];
        Arrays.fill(labelOfRoot, -1);
        int[] labels = new int[n];
        int next = 0;
        for (int i = 0; i < n; i++) {
            int root = find(parent, i);
            if (labelOfRoot[root] < 0) {
                labelOfRoot[root] = next++;
            }
            labels[i] = labelOfRoot[root];
        }
        return labels;
    }

    private static int checkedSize(double[][] correlation) {
        if (correlation == null) {
            throw new IllegalArgumentException("correlation matrix must not be null");
        }
        int n = correlation.length;
        for (int i = 0; i < n; i++) {
            if (correlation[i] == null || correlation[i].length != n) {
                throw new IllegalArgumentException("correlation matrix must be square: row " + i + " should have " + n + " entries");
            }
        }
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                double a = correlation[i][j];
                double b = correlation[j][i];
                if (!Double.isNaN(a) && !(Math.abs(a) <= 1.0 + TOLERANCE)) {
                    throw new IllegalArgumentException("correlation at (" + i + ", " + j + ") is " + a + "; it must lie in [-1, 1] or be NaN");
                }
                boolean symmetric = Double.isNaN(a) ? Double.isNaN(b) : Math.abs(a - b) <= TOLERANCE;
                if (!symmetric) {
                    throw new IllegalArgumentException("correlation matrix must be symmetric: (" + i + ", " + j + ") is " + a
                            + " but (" + j + ", " + i + ") is " + b);
                }
            }
        }
        return n;
    }
}
