package dev.winnow.stats;

import org.junit.jupiter.api.Test;

import java.util.Arrays;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

/** The radix sort behind {@link Ranks#sortedOrder} against the JDK's {@link Arrays#sort(long[])} as the reference. */
class RanksTest {

    @Test
    void theRadixSortOrdersLongsAsTheJdkDoes() {
        SplittableRandom random = new SplittableRandom(20261202);
        for (int n : new int[] {0, 1, 2, 1023, 1024, 1025, 3000, 5000}) {
            for (int kind = 0; kind < 5; kind++) {
                long[] keys = new long[n];
                for (int i = 0; i < n; i++) {
                    keys[i] = switch (kind) {
                        case 0 -> random.nextLong();                                       // every digit varies
                        case 1 -> random.nextLong(-5, 5);                                  // many ties, both signs
                        case 2 -> 42L << 40 | random.nextInt(1 << 12);                    // high digits all shared
                        case 3 -> i % 3 == 0 ? Long.MIN_VALUE : (i % 3 == 1 ? Long.MAX_VALUE : 0); // the extremes
                        default -> Double.doubleToRawLongBits(random.nextGaussian() * 0.02); // raw double bits
                    };
                }
                long[] expected = keys.clone();
                Arrays.sort(expected);
                Ranks.sortSigned(keys);
                assertArrayEquals(expected, keys, "n=" + n + ", kind " + kind);
            }
        }
    }

    @Test
    void averageRanksAboveTheRadixThresholdMatchTheDefinition() {
        // average ranks by counting: rank(x_i) = #{x_j < x_i} + (#{x_j == x_i} + 1) / 2 (the usual tie rule of
        // Spearman's coefficient, as scipy.stats.rankdata method='average' states it)
        SplittableRandom random = new SplittableRandom(7);
        int n = 2_000;
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = random.nextInt(4) == 0 ? Math.floor(random.nextDouble() * 50) : random.nextGaussian();
        }
        x[5] = -0.0;
        x[6] = 0.0;
        double[] expected = new double[n];
        for (int i = 0; i < n; i++) {
            int less = 0;
            int equal = 0;
            for (double v : x) {
                less += v < x[i] ? 1 : 0;
                equal += v == x[i] ? 1 : 0;
            }
            expected[i] = less + (equal + 1) / 2.0;
        }
        assertArrayEquals(expected, Ranks.averageRanks(x, n));
    }
}
