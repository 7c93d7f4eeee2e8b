package dev.winnow.construct;

import dev.winnow.stats.Frequency;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Defaults and checks of the loadings settings (the defaults are our choice, stated in LoadingsSpec), and portfolio exposures worked by hand. */
class LoadingsSpecTest {

    @Test
    void defaultsFollowTheFrequency() {
        assertEquals(new LoadingsSpec(List.of("a", "b"), 252, 126), LoadingsSpec.withDefaults(List.of("a", "b"), null, null, Frequency.DAILY));
        assertEquals(new LoadingsSpec(List.of("a"), 60, 30), LoadingsSpec.withDefaults(List.of("a"), null, null, Frequency.MONTHLY));
        assertEquals(104, LoadingsSpec.withDefaults(List.of("a"), null, null, Frequency.WEEKLY).window());
        assertEquals(20, LoadingsSpec.withDefaults(List.of("a"), null, null, Frequency.QUARTERLY).window());
        assertEquals(new LoadingsSpec(List.of("a"), 41, 20), LoadingsSpec.withDefaults(List.of("a"), 41, null, Frequency.DAILY),
                "min_obs = W / 2 by integer division");
        assertEquals(8, LoadingsSpec.withDefaults(List.of("a", "b", "c", "d", "e", "f"), null, null, Frequency.ANNUAL).minObs(),
                "W / 2 = 5 is raised to factors + 2 = 8");
    }

    @Test
    void rejectsSettingsThatCannotBeFitted() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new LoadingsSpec(List.of("a", "b"), 3, 3));
        assertTrue(e.getMessage().contains("window must be at least"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new LoadingsSpec(List.of("a"), 10, 11));
        assertThrows(IllegalArgumentException.class, () -> new LoadingsSpec(List.of(), 10, 5));
        assertThrows(IllegalArgumentException.class, () -> new LoadingsSpec(List.of("a", "a"), 10, 5));
    }

    @Test
    void portfolioExposureWorkedByHand() {
        // Betas (factor x security): security 1 -> (1.2, -0.5), security 2 -> (0.8, 0.3), security 3 has too few dates.
        LoadingsTable table = new LoadingsTable(LocalDate.of(2024, 5, 31), 10, new int[] {1, 2, 3}, new int[] {20, 20, 4},
                new double[] {0.001, 0.0, Double.NaN}, new double[][] {{1.2, 0.8, Double.NaN}, {-0.5, 0.3, Double.NaN}},
                new double[] {0.5, 0.4, Double.NaN}, new double[] {0.01, 0.02, Double.NaN}, 0L);
        PortfolioExposure p = PortfolioExposure.of(table, new int[] {1, 2, 3, -1}, new double[] {0.5, -0.25, 0.15, 0.1});
        // 0.5 * 1.2 - 0.25 * 0.8 = 0.4; 0.5 * -0.5 - 0.25 * 0.3 = -0.325; coverage 0.75 / 1.0
        assertArrayEquals(new double[] {0.4, -0.325}, p.exposures(), 1e-15);
        assertEquals(0.75, p.coverage(), 1e-15);
        assertEquals(List.of(2, 3), p.missingHoldings());
        assertEquals("4 usable dates, fewer than min_obs 10", table.reason(2));
    }
}
