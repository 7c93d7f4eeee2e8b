package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * A build that forms ahead on a second thread fails the way a build on one thread does: the panel's error reaches
 * the caller (not a hang, not another error), whether it comes while the forming thread is far ahead or at the end.
 */
class FormingAheadFailureTest {

    /** The fixture panel, except that grid date #{@code bad} comes back with the rows of another date. */
    private static PanelSource brokenAt(int bad) {
        PanelSource panel = ConstructionFixtures.panel();
        return new PanelSource() {
            @Override
            public List<LocalDate> dates() {
                return panel.dates();
            }

            @Override
            public CrossSection crossSection(int index) {
                return panel.crossSection(index == bad ? index - 1 : index);
            }
        };
    }

    @Test
    void thePanelsErrorReachesTheCaller() {
        Map.Entry<String, FactorDefinition> sort = ConstructionFixtures.definitions().entrySet().stream()
                .filter(e -> e.getValue().riskFree() == null).findFirst().orElseThrow();
        int dates = ConstructionFixtures.panel().dates().size();
        assertTrue(dates >= FactorEngine.FORMED_AHEAD_MIN_DATES, "the build must form ahead");
        for (int bad : new int[] {3, dates / 2, dates - 1}) {
            IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                    () -> FactorEngine.build(sort.getValue(), brokenAt(bad), null, Map.of(), null, ConstructionFixtures.FORMING), sort.getKey() + " broken at " + bad);
            assertTrue(e.getMessage().contains("grid date #" + bad), e.getMessage());
        }
    }
}
