package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.construct.FactorDefinition.Rebalance;
import dev.winnow.construct.FactorDefinition.Weighting;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Test-only parser of the fixture generator's definition specs, e.g.
 * {@code method=sort;signal=bm;buckets=3;include=sector:A|B;breakpoints=listing:main}.
 */
final class DefinitionSpec {
    private DefinitionSpec() {
    }

    static FactorDefinition parse(String panel, String spec) {
        Map<String, String> f = new LinkedHashMap<>();
        for (String item : spec.split(";")) {
            String[] kv = item.split("=", 2);
            f.put(kv[0], kv[1]);
        }
        FactorDefinition.Builder b = FactorDefinition.builder(upper(Method.class, f.remove("method"))).panel(panel);
        Universe universe = Universe.ALL;
        for (Map.Entry<String, String> e : f.entrySet()) {
            String v = e.getValue();
            switch (e.getKey()) {
                case "signal" -> b.signal(v);
                case "direction" -> b.direction(upper(Direction.class, v));
                case "buckets" -> b.buckets(Integer.parseInt(v));
                case "weighting" -> b.weighting(upper(Weighting.class, v));
                case "lag" -> b.lag(Integer.parseInt(v));
                case "rebalance" -> b.rebalance(upper(Rebalance.class, v));
                case "rebalance_month" -> b.rebalanceMonth(Integer.parseInt(v));
                case "output" -> b.output(upper(Output.class, v));
                case "risk_free" -> b.riskFree(v);
                case "cost_bps" -> b.costBps(Double.parseDouble(v));
                case "breakpoints" -> b.breakpoints(labelEquals(v));
                case "min_market_cap" -> universe = universe.withMinMarketCap(Double.parseDouble(v));
                case "size_half" -> universe = universe.withSizeHalf(upper(SizeHalf.class, v));
                case "segment" -> universe = universe.withSegment(labelEquals(v));
                case "include", "exclude" -> {
                    String[] parts = v.split(":");
                    LabelFilter.Mode mode = upper(LabelFilter.Mode.class, e.getKey());
                    universe = universe.withLabelFilter(parts[0], new LabelFilter(mode, List.of(parts[1].split("\\|"))));
                }
                default -> throw new IllegalArgumentException("unknown spec key " + e.getKey());
            }
        }
        return b.universe(universe.equals(Universe.ALL) ? null : universe).build();
    }

    private static LabelEquals labelEquals(String text) {
        String[] parts = text.split(":");
        return new LabelEquals(parts[0], parts[1]);
    }

    private static <E extends Enum<E>> E upper(Class<E> type, String text) {
        return Enum.valueOf(type, text.toUpperCase(Locale.ROOT));
    }
}
