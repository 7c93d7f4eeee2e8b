package dev.winnow.stats;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The keyed correlation (ranks read off a sort order computed once) is the correlation of the common values gathered
 * in key order and ranked on their own, to the last bit, with ties, zeros of both signs and few common keys.
 */
class KeyedValuesTest {

    @Test
    void equalsTheCorrelationOfTheCommonValuesRankedOnTheirOwn() {
        SplittableRandom random = new SplittableRandom(11);
        for (int trial = 0; trial < 306; trial++) {
            int securities = trial < 300 ? 400 : 5000; // the last few at a benchmark cross-section's size
            int[][] keys = new int[2][];
            double[][] values = new double[2][];
            for (int side = 0; side < 2; side++) {
                List<Integer> k = new ArrayList<>();
                for (int id = 0; id < securities; id++) {
                    if (random.nextDouble() < 0.7) {
                        k.add(id);
                    }
                }
                keys[side] = k.stream().mapToInt(Integer::intValue).toArray();
                values[side] = new double[keys[side].length];
                boolean coarse = trial % 3 == 0; // many ties
                for (int i = 0; i < values[side].length; i++) {
                    double v = coarse ? random.nextInt(7) - 3 : random.nextGaussian();
                    values[side][i] = v == 0 && random.nextBoolean() ? -0.0 : v;
                }
            }
            // gather the common keys' values in key order, as a plain pairwise computation would
            List<double[]> pairs = new ArrayList<>();
            for (int i = 0, j = 0; i < keys[0].length; i++) {
                while (j < keys[1].length && keys[1][j] < keys[0][i]) {
                    j++;
                }
                if (j < keys[1].length && keys[1][j] == keys[0][i]) {
                    pairs.add(new double[] {values[0][i], values[1][j]});
                }
            }
            double[] x = pairs.stream().mapToDouble(p -> p[0]).toArray();
            double[] y = pairs.stream().mapToDouble(p -> p[1]).toArray();
            for (Correlations.Method method : Correlations.Method.values()) {
                KeyedValues a = KeyedValues.of(keys[0], values[0], method);
                KeyedValues b = KeyedValues.of(keys[1], values[1], method);
                double expected = method == Correlations.Method.SPEARMAN ? Correlations.spearman(x, y) : Correlations.pearson(x, y);
                assertEquals(Double.doubleToLongBits(expected), Double.doubleToLongBits(KeyedValues.correlation(a, b, method, 3)),
                        "trial " + trial + " " + method + ": " + expected);
                assertTrue(Double.isNaN(KeyedValues.correlation(a, b, method, x.length + 1)), "below the minimum of common keys");
            }
        }
    }

    @Test
    void rejectsWhatItCannotPair() {
        assertThrows(IllegalArgumentException.class, () -> KeyedValues.of(new int[] {1, 1}, new double[] {1, 2}, Correlations.Method.PEARSON));
        assertThrows(IllegalArgumentException.class, () -> KeyedValues.of(new int[] {1, 2}, new double[] {1, Double.NaN}, Correlations.Method.PEARSON));
        KeyedValues plain = KeyedValues.of(new int[] {1, 2, 3}, new double[] {1, 2, 3}, Correlations.Method.PEARSON);
        assertThrows(IllegalArgumentException.class, () -> KeyedValues.correlation(plain, plain, Correlations.Method.SPEARMAN, 3));
    }
}
