package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.function.UnaryOperator;
import org.junit.jupiter.api.Test;

class MultipleTestingTest {

    /**
     * The 15 p-values of the worked example in Benjamini and Hochberg (1995, JRSS B 57(1), section 4),
     * quoted from memory. From memory: at q = 0.05 the BH procedure rejects the 4 smallest, Bonferroni
     * the 3 smallest; Holm also rejects 3 here (p_(4) = 0.0095 > 0.05/12), which follows from the definition.
     */
    private static final double[] BH_PAPER_EXAMPLE = {
        0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459,
        0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.0000
    };

    @Test
    void decisionsOnTheBenjaminiHochbergPaperExample() {
        assertEquals(4, rejectedAt(MultipleTesting.benjaminiHochberg(BH_PAPER_EXAMPLE), 0.05));
        assertEquals(3, rejectedAt(MultipleTesting.bonferroni(BH_PAPER_EXAMPLE), 0.05));
        assertEquals(3, rejectedAt(MultipleTesting.holm(BH_PAPER_EXAMPLE), 0.05));
    }

    @Test
    void adjustedPValuesMatchStatsmodelsMultipletests() {
        // Fixture: statsmodels.stats.multitest.multipletests, see src/test/scripts/multiple_testing_fixture.py
        List<double[]> rows = FixtureReader.csvRows("multiple_testing.csv");
        double[] p = column(rows, 0);
        assertMatches(column(rows, 1), MultipleTesting::bonferroni, p);
        assertMatches(column(rows, 2), MultipleTesting::holm, p);
        assertMatches(column(rows, 3), MultipleTesting::benjaminiHochberg, p);
        assertMatches(column(rows, 4), MultipleTesting::benjaminiYekutieli, p);
    }

    @Test
    void benjaminiYekutieliOnThreeTestsByHand() {
        // c(3) = 1 + 1/2 + 1/3 = 11/6; BH-adjusted (0.01, 0.02, 0.04) = (0.03, 0.03, 0.04) before the factor.
        double c = 11.0 / 6.0;
        assertArrayEquals(new double[] {0.03 * c, 0.04 * c, 0.03 * c},
                MultipleTesting.benjaminiYekutieli(new double[] {0.01, 0.04, 0.02}), 1e-15);
    }

    @Test
    void nanIsExcludedFromTheCountAndStaysNaN() {
        double[] adjusted = MultipleTesting.bonferroni(new double[] {0.01, Double.NaN, 0.02});
        assertEquals(0.02, adjusted[0], 1e-15);
        assertTrue(Double.isNaN(adjusted[1]));
        assertEquals(0.04, adjusted[2], 1e-15);
        assertEquals(0, MultipleTesting.holm(new double[0]).length);
    }

    @Test
    void rejectsPValuesOutsideTheUnitInterval() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> MultipleTesting.holm(new double[] {0.2, 1.5}));
        assertTrue(e.getMessage().contains("index 1"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> MultipleTesting.benjaminiHochberg(null));
    }

    private static void assertMatches(double[] expected, UnaryOperator<double[]> method, double[] p) {
        double[] actual = method.apply(p);
        for (int i = 0; i < p.length; i++) {
            if (Double.isNaN(expected[i])) {
                assertTrue(Double.isNaN(actual[i]), "index " + i);
            } else {
                assertEquals(expected[i], actual[i], 1e-12, "index " + i);
            }
        }
    }

    private static long rejectedAt(double[] adjusted, double q) {
        return Arrays.stream(adjusted).filter(a -> a <= q).count();
    }

    private static double[] column(List<double[]> rows, int j) {
        return rows.stream().mapToDouble(r -> r[j]).toArray();
    }
}
