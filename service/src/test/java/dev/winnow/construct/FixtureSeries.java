package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.List;

/** Compares a build with fixture rows in the construction_expected.csv layout (obs, formation, summary), to 1e-12. */
final class FixtureSeries {
    private static final double TOLERANCE = 1e-12;

    private FixtureSeries() {
    }

    static void assertMatches(List<String[]> rows, BuildResult result, String id) {
        List<String[]> obs = rows.stream().filter(r -> r[1].equals("obs")).toList();
        List<String[]> formations = rows.stream().filter(r -> r[1].equals("formation")).toList();
        String[] summary = rows.stream().filter(r -> r[1].equals("summary")).findFirst().orElseThrow();
        assertEquals(obs.size(), result.observations().size(), id + ": number of returns");
        for (int i = 0; i < obs.size(); i++) {
            String[] want = obs.get(i);
            FactorObservation got = result.observations().get(i);
            String where = id + " " + want[2];
            assertEquals(LocalDate.parse(want[2]), got.date(), where);
            assertClose(want[3], got.spread(), where + " spread");
            assertClose(want[4], got.longLeg(), where + " long");
            assertClose(want[5], got.shortLeg(), where + " short");
            assertClose(want[6], got.net(), where + " net");
        }
        assertEquals(formations.size(), result.formations().size(), id + ": number of formations");
        for (int i = 0; i < formations.size(); i++) {
            assertEquals(LocalDate.parse(formations.get(i)[2]), result.formations().get(i).date());
            assertClose(formations.get(i)[7], result.formations().get(i).turnover(), id + " turnover " + i);
        }
        assertEquals(Integer.parseInt(summary[8]), result.periodsWithoutReturn(), id + ": periods without return");
    }

    static void assertClose(String expected, double actual, String what) {
        if (expected.isEmpty()) {
            assertTrue(Double.isNaN(actual), what + ": expected missing, got " + actual);
        } else {
            assertEquals(Double.parseDouble(expected), actual, TOLERANCE, what);
        }
    }
}
