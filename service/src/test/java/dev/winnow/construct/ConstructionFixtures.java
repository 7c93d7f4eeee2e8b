package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;

/**
 * The committed construction fixtures of service/src/test/scripts/construction_fixtures.py, for tests in any
 * package: the seeded panel, its risk-free series (factor name {@code rf}) and the 22 definitions (on panel
 * {@code fixture}).
 */
public final class ConstructionFixtures {
    /**
     * The forming threads of the construction tests' builds (a service wires its own): one set for the test run,
     * as one service has one; its daemon threads end a minute after the last build.
     */
    public static final FormingThreads FORMING = FormingThreads.perProcessor();

    private static final String DIR = "/fixtures/";

    private ConstructionFixtures() {
    }

    static InMemoryPanel panel() {
        return PanelCsv.read(DIR + "construction_panel.csv", List.of("bm", "score"), List.of("sector", "listing"));
    }

    /** The panel's cross-sections in date order. */
    public static List<CrossSection> sections() {
        InMemoryPanel panel = panel();
        return IntStream.range(0, panel.dates().size()).mapToObj(panel::crossSection).toList();
    }

    public static ReturnSeries riskFree() {
        List<String[]> rf = PanelCsv.readRows(DIR + "construction_riskfree.csv");
        LocalDate[] dates = new LocalDate[rf.size() - 1];
        double[] values = new double[rf.size() - 1];
        for (int i = 1; i < rf.size(); i++) {
            dates[i - 1] = LocalDate.parse(rf.get(i)[0]);
            values[i - 1] = Double.parseDouble(rf.get(i)[1]);
        }
        return new ReturnSeries(dates, values);
    }

    /** The fixture definitions by id, in file order. */
    public static Map<String, FactorDefinition> definitions() {
        Map<String, FactorDefinition> definitions = new LinkedHashMap<>();
        for (String[] row : PanelCsv.readRows(DIR + "construction_definitions.csv").subList(1, 23)) {
            definitions.put(row[0], DefinitionSpec.parse("fixture", row[1]));
        }
        return definitions;
    }

    /**
     * The recipe fixture definitions of signal_fixtures.py (panel {@code fixture}) that read no factor: recipes,
     * within-group and dependent double sorts, rank weights.
     */
    public static Map<String, FactorDefinition> recipeDefinitions() {
        Map<String, FactorDefinition> out = new LinkedHashMap<>();
        SignalFixtures.definitions().forEach((id, def) -> {
            if (def.recipeFactors().isEmpty()) {
                out.put(id, def);
            }
        });
        return out;
    }

    /** A panel source over cross-sections held in memory. */
    public static PanelSource inMemory(List<CrossSection> sections) {
        return new InMemoryPanel(sections);
    }
}
