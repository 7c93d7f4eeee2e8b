package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

class HierarchicalClusteringTest {

    @Test
    void partitionsMatchScipyAverageLinkage() {
        // Fixture: scipy.cluster.hierarchy.linkage(method="average") + fcluster(criterion="distance"),
        // see src/test/scripts/clustering_fixture.py. Partitions are compared, not label numbers.
        JsonNode fixture = FixtureReader.json("clustering.json");
        for (JsonNode c : fixture.get("cases")) {
            double[][] correlation = FixtureReader.matrix(c.get("correlation"));
            for (JsonNode t : fixture.get("thresholds")) {
                int[] scipy = FixtureReader.ints(c.get("scipy_labels").get(t.asText()));
                int[] ours = HierarchicalClustering.averageLinkageClusters(correlation, t.asDouble());
                assertArrayEquals(canonical(scipy), ours, c.get("name").asText() + " at threshold " + t.asText());
            }
        }
    }

    @Test
    void averageLinkageByHand() {
        // rho(0,1) = 0.9, rho(2,0) = 0.5, rho(2,1) = 0.3: {0,1} merge at distance 0.1; then
        // d({0,1}, 2) = ((1 - 0.5) + (1 - 0.3)) / 2 = 0.6, i.e. average correlation 0.4.
        double[][] rho = {{1, 0.9, 0.5}, {0.9, 1, 0.3}, {0.5, 0.3, 1}};
        assertArrayEquals(new int[] {0, 0, 0}, HierarchicalClustering.averageLinkageClusters(rho, 0.4));
        assertArrayEquals(new int[] {0, 0, 1}, HierarchicalClustering.averageLinkageClusters(rho, 0.41));
        assertArrayEquals(new int[] {0, 1, 2}, HierarchicalClustering.averageLinkageClusters(rho, 0.95));
    }

    @Test
    void missingCorrelationCountsAsUncorrelated() {
        double[][] rho = {{1, Double.NaN}, {Double.NaN, 1}};
        assertArrayEquals(new int[] {0, 0}, HierarchicalClustering.averageLinkageClusters(rho, 0.0));
        assertArrayEquals(new int[] {0, 1}, HierarchicalClustering.averageLinkageClusters(rho, 0.01));
    }

    @Test
    void rejectsMalformedMatrices() {
        assertThrows(IllegalArgumentException.class,
                () -> HierarchicalClustering.averageLinkageClusters(new double[][] {{1, 0.2}, {0.3, 1}}, 0.5));
        assertThrows(IllegalArgumentException.class,
                () -> HierarchicalClustering.averageLinkageClusters(new double[][] {{1, 0.2}}, 0.5));
        assertThrows(IllegalArgumentException.class,
                () -> HierarchicalClustering.averageLinkageClusters(new double[][] {{1, 1.5}, {1.5, 1}}, 0.5));
        assertThrows(IllegalArgumentException.class,
                () -> HierarchicalClustering.averageLinkageClusters(new double[][] {{1}}, 2.0));
    }

    /** Relabels any partition as 0, 1, ... in order of first member. */
    private static int[] canonical(int[] labels) {
        Map<Integer, Integer> renumber = new HashMap<>();
        int[] out = new int[labels.length];
        for (int i = 0; i < labels.length; i++) {
            out[i] = renumber.computeIfAbsent(labels[i], l -> renumber.size());
        }
        return out;
    }
}
