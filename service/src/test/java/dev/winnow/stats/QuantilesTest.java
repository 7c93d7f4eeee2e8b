package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.apache.commons.math3.stat.descriptive.rank.Percentile.EstimationType;
import org.junit.jupiter.api.Test;

class QuantilesTest {

    @Test
    void handWorkedTypeSeven() {
        // Hyndman and Fan (1996) definition 7 by hand on x = 1..10: p = 0.3 gives h = 9 * 0.3 = 2.7,
        // Q = x[2] + 0.7 (x[3] - x[2]) = 3 + 0.7 = 3.7 (R's default quantile gives 3.7 too; from memory).
        double[] x = {10, 9, 8, 7, 6, 5, 4, 3, 2, 1};
        assertEquals(3.7, Quantiles.type7(x, 0.3), 1e-15);
        // p = 0.5: h = 4.5, Q = 5 + 0.5 * 1 = 5.5, the usual median of an even sample.
        assertEquals(5.5, Quantiles.type7(x, 0.5), 0.0);
        assertEquals(1.0, Quantiles.type7(x, 0.0), 0.0);
        assertEquals(10.0, Quantiles.type7(x, 1.0), 0.0);
        // ties: x = {2, 2, 2, 5}, p = 0.5: h = 1.5, Q = 2 + 0.5 * 0 = 2, exactly one of the tied values
        assertEquals(2.0, Quantiles.type7(new double[] {5, 2, 2, 2}, 0.5), 0.0);
        assertEquals(10.0, x[0], 0.0, "input must not be reordered");
    }

    @Test
    void matchesCommonsMathR7() {
        // General-purpose reference: Apache Commons Math 3.6.1 Percentile with EstimationType.R_7.
        Random random = new Random(1996);
        for (int trial = 0; trial < 200; trial++) {
            int n = 1 + random.nextInt(60);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = trial % 3 == 0 ? random.nextInt(5) : random.nextGaussian() * 100;
            }
            Percentile reference = new Percentile().withEstimationType(EstimationType.R_7);
            for (double p : new double[] {0.01, 0.1, 0.2, 0.25, 0.3, 1.0 / 3, 0.5, 2.0 / 3, 0.7, 0.75, 0.9, 1.0}) {
                double expected = reference.evaluate(x, p * 100);
                assertEquals(expected, Quantiles.type7(x, p), 1e-12 * Math.max(1, Math.abs(expected)), "n=" + n + " p=" + p);
            }
        }
    }

    @Test
    void matchesNumpyLinearFixture() throws IOException {
        // numpy.quantile default method 'linear' (= type 7), via service/src/test/scripts/construction_fixtures.py
        int checked = 0;
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                getClass().getResourceAsStream("/fixtures/quantiles_numpy.csv"), StandardCharsets.UTF_8))) {
            in.readLine();
            for (String line = in.readLine(); line != null; line = in.readLine()) {
                String[] cells = line.split(",");
                double[] values = Arrays.stream(cells[1].split(";")).mapToDouble(Double::parseDouble).toArray();
                double p = Double.parseDouble(cells[2]);
                double expected = Double.parseDouble(cells[3]);
                assertEquals(expected, Quantiles.type7(values, p), 1e-13 * Math.max(1, Math.abs(expected)), line);
                checked++;
            }
        }
        assertTrue(checked >= 80, "fixture rows read: " + checked);
    }

    @Test
    void emptySampleIsNaNAndBadArgumentsAreRejected() {
        assertTrue(Double.isNaN(Quantiles.type7(new double[0], 0.5)));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.type7(new double[] {1, 2}, 1.5));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.type7(new double[] {1, Double.NaN}, 0.5));
    }

    @Test
    void selectionGivesTheSortedSamplesQuantilesAndCommonsMathR7() {
        // the selection puts the same order statistics in place as a sort; reference as above: Commons Math 3.6.1 R_7
        Random random = new Random(1961);
        double[][] probabilitySets = {{0.2, 0.4, 0.6, 0.8}, {0.5}, {0.3, 0.7}, {0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9},
            {0.0, 1.0}, {1.0 / 3, 2.0 / 3}, {0.9, 0.1, 0.5, 0.5, 1.0, 0.0, 0.25}}; // the last in no order, one twice
        for (int trial = 0; trial < 600; trial++) {
            int n = trial < 30 ? trial : 1 + random.nextInt(trial % 5 == 0 ? 4000 : 300);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = switch (trial % 4) {
                    case 0 -> random.nextInt(3);            // long runs of ties
                    case 1 -> i;                            // already sorted
                    case 2 -> n - i;                        // reversed
                    default -> random.nextGaussian() * 100;
                };
            }
            double[] sorted = x.clone();
            Arrays.sort(sorted);
            Percentile reference = new Percentile().withEstimationType(EstimationType.R_7);
            for (double[] ps : probabilitySets) {
                double[] got = Quantiles.type7Select(x.clone(), ps);
                for (int q = 0; q < ps.length; q++) {
                    assertEquals(Quantiles.type7Sorted(sorted, ps[q]), got[q], 0.0, "n=" + n + " p=" + ps[q]);
                    if (n > 0) {
                        double expected = reference.evaluate(x, ps[q] == 0.0 ? Double.MIN_VALUE : ps[q] * 100);
                        assertEquals(expected, got[q], 1e-12 * Math.max(1, Math.abs(expected)), "R_7 n=" + n + " p=" + ps[q]);
                    }
                }
            }
        }
        assertThrows(IllegalArgumentException.class, () -> Quantiles.type7Select(new double[] {1, Double.NaN}, new double[] {0.5}));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.type7Select(new double[] {1, 2}, new double[] {-0.1}));
    }
}
