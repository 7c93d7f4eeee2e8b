package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;

class CrossSectionalZScoreTest {

    /**
     * Hand-worked: ten zeros, 2 and 40 (12 present values) plus one NaN.
     * m = 42/12 = 3.5; SS = 10 * 3.5^2 + 1.5^2 + 36.5^2 = 122.5 + 2.25 + 1332.25 = 1457; s = sqrt(1457/11).
     * Upper bound m + 3s = 3.5 + 3 sqrt(1457/11) = 38.02667..., so 40 is clipped to c = 38.02667...; the
     * lower bound is negative and clips nothing. Clipped mean m' = (2 + c)/12 and
     * sd' = sqrt((10 m'^2 + (2 - m')^2 + (c - m')^2) / 11); z = (x - m') / sd'.
     */
    @Test
    void handWorkedExample() {
        double[] x = new double[13];
        x[10] = 2;
        x[11] = 40;
        x[12] = Double.NaN;
        double c = 3.5 + 3 * Math.sqrt(1457.0 / 11);
        double mean = (2 + c) / 12;
        double sd = Math.sqrt((10 * mean * mean + (2 - mean) * (2 - mean) + (c - mean) * (c - mean)) / 11);
        double[] z = CrossSectionalZScore.winsorisedZScores(x);
        assertEquals(38.02667, c, 1e-5);
        assertEquals(-mean / sd, z[0], 1e-12);
        assertEquals((2 - mean) / sd, z[10], 1e-12);
        assertEquals((c - mean) / sd, z[11], 1e-12);
        assertTrue(Double.isNaN(z[12]));
    }

    @Test
    void matchesNumpyFixture() {
        // Fixture: numpy nanmean/nanstd(ddof=1)/clip, see src/test/scripts/zscore_fixture.py
        for (JsonNode c : FixtureReader.json("zscore.json").get("cases")) {
            double[] expected = FixtureReader.doubles(c.get("expected"));
            double[] actual = CrossSectionalZScore.winsorisedZScores(FixtureReader.doubles(c.get("values")));
            for (int i = 0; i < expected.length; i++) {
                if (Double.isNaN(expected[i])) {
                    assertTrue(Double.isNaN(actual[i]), "index " + i);
                } else {
                    assertEquals(expected[i], actual[i], 1e-12, "index " + i);
                }
            }
        }
    }

    @Test
    void undefinedWhenFewerThanTwoValuesOrNoDispersion() {
        assertTrue(Double.isNaN(CrossSectionalZScore.winsorisedZScores(new double[] {1.0, Double.NaN})[0]));
        double[] constant = CrossSectionalZScore.winsorisedZScores(new double[] {0.1, 0.1, 0.1});
        assertTrue(Double.isNaN(constant[0]) && Double.isNaN(constant[2]));
    }

    @Test
    void rejectsInfinityAndBadLimit() {
        assertThrows(IllegalArgumentException.class,
                () -> CrossSectionalZScore.winsorisedZScores(new double[] {1, Double.NEGATIVE_INFINITY}));
        assertThrows(IllegalArgumentException.class, () -> CrossSectionalZScore.winsorisedZScores(new double[] {1, 2}, 0));
    }
}
