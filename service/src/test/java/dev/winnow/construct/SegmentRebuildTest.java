package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import java.util.stream.Collectors;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * Rebuilding inside segments against the independent pandas/numpy implementation of the construction rules
 * (service/src/test/scripts/construction_fixtures.py, fixtures construction_*.csv): the fixture holds series of
 * definitions with a size half or a label segment; rebuilding the same definition without that restriction through
 * {@link SegmentRebuild} must give those series in the matching segment, to 1e-12.
 */
class SegmentRebuildTest {
    private static final String DIR = "/fixtures/";
    private static InMemoryPanel panel;
    private static Map<String, String> specs;
    private static List<String[]> expected;

    @BeforeAll
    static void load() {
        panel = PanelCsv.read(DIR + "construction_panel.csv", List.of("bm", "score"), List.of("sector", "listing"));
        specs = PanelCsv.readRows(DIR + "construction_definitions.csv").stream().skip(1)
                .collect(Collectors.toMap(r -> r[0], r -> r[1]));
        expected = PanelCsv.readRows(DIR + "construction_expected.csv");
    }

    @Test
    void smallHalfOfAQuintileSortMatchesPandas() {
        FactorDefinition whole = DefinitionSpec.parse("fixture", specs.get("sort_bm_small_half").replace(";size_half=small", ""));
        List<SegmentRebuild.Segment> halves = SegmentRebuild.bySizeHalf(whole, panel, null, ConstructionFixtures.FORMING);
        assertEquals(List.of("small", "big"), halves.stream().map(SegmentRebuild.Segment::value).toList());
        assertMatches("sort_bm_small_half", halves.get(0).spread());
    }

    @Test
    void bigHalfOfTheMarketMatchesPandas() {
        FactorDefinition whole = DefinitionSpec.parse("fixture", specs.get("market_eq_quarterly_big").replace(";size_half=big", ""));
        assertMatches("market_eq_quarterly_big", SegmentRebuild.bySizeHalf(whole, panel, null, ConstructionFixtures.FORMING).get(1).spread());
    }

    @Test
    void labelSegmentMatchesPandas() {
        String spec = specs.get("sort_bm_big_half_segment_cost");
        FactorDefinition withoutSegment = DefinitionSpec.parse("fixture", spec.replace(";segment=sector:B", ""));
        List<String> sectors = SegmentRebuild.distinctLabels(panel, "sector");
        assertEquals(sectorsInTheCsv(), sectors);
        List<SegmentRebuild.Segment> segments = SegmentRebuild.byLabel(withoutSegment, panel, null, "sector", sectors,
                ConstructionFixtures.FORMING);
        SegmentRebuild.Segment b = segments.get(sectors.indexOf("B"));
        assertEquals("B", b.value());
        assertMatches("sort_bm_big_half_segment_cost", b.spread());
    }

    /** The sector values read straight from the panel CSV, sorted. */
    private static List<String> sectorsInTheCsv() {
        List<String[]> rows = PanelCsv.readRows(DIR + "construction_panel.csv");
        int column = List.of(rows.get(0)).indexOf("sector");
        TreeSet<String> values = new TreeSet<>();
        rows.stream().skip(1).map(r -> r[column]).filter(v -> !v.isEmpty()).forEach(values::add);
        return List.copyOf(values);
    }

    private static void assertMatches(String id, ReturnSeries actual) {
        List<String[]> obs = expected.stream().filter(r -> r[0].equals(id) && r[1].equals("obs")).toList();
        assertEquals(obs.size(), actual.size(), id + ": number of returns");
        for (int i = 0; i < obs.size(); i++) {
            assertEquals(LocalDate.parse(obs.get(i)[2]), actual.date(i), id);
            assertEquals(Double.parseDouble(obs.get(i)[3]), actual.value(i), 1e-12, id + " at " + actual.date(i));
        }
    }
}
