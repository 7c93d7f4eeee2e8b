package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.construct.FactorDefinition.Rebalance;
import dev.winnow.construct.FactorDefinition.Weighting;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The one place that checks a {@link FactorDefinition}. Problems are human-readable sentences naming fields as the
 * API spells them (snake_case) and saying what to fix.
 */
public final class DefinitionValidator {
    public static final int MIN_BUCKETS = 2;
    public static final int MAX_BUCKETS = 20;

    private DefinitionValidator() {
    }

    /**
     * All problems of a definition against a panel's schema; empty when the definition can be built.
     * With a null schema (or for EXTERNAL, which needs no panel) only the schema-independent checks run.
     */
    public static List<String> validate(FactorDefinition def, PanelSchema schema) {
        List<String> problems = new ArrayList<>();
        if (def.method() == null) {
            problems.add("method is required: one of sort, size_sort, market, rank_weighted, external");
            return problems;
        }
        if (def.method() == Method.EXTERNAL) {
            checkExternal(def, problems);
            return problems;
        }
        checkShape(def, problems);
        if (schema != null) {
            checkColumns(def, schema, problems);
        }
        return problems;
    }

    /** Throws with every schema-independent problem when the definition cannot be built by the engine. */
    public static void requireBuildable(FactorDefinition def) {
        List<String> problems = validate(def, null);
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("invalid factor definition: " + String.join("; ", problems));
        }
        if (def.method() == Method.EXTERNAL) {
            throw new IllegalArgumentException("method external is uploaded, not built: store its returns instead");
        }
    }

    private static void checkExternal(FactorDefinition def, List<String> problems) {
        Object[][] fields = {
            {"panel", def.panel()}, {"signal", def.signal()}, {"direction", def.direction()},
            {"buckets", def.buckets()}, {"weighting", def.weighting()}, {"lag", def.lag()},
            {"rebalance", def.rebalance()}, {"rebalance_month", def.rebalanceMonth()}, {"output", def.output()},
            {"risk_free", def.riskFree()}, {"universe", def.universe()}, {"breakpoints", def.breakpoints()},
            {"within", def.within()}, {"control", def.control()},
            {"cost_bps", def.costBps()},
        };
        for (Object[] field : fields) {
            if (field[1] != null) {
                problems.add("'" + field[0] + "' does not apply to method external (its returns are uploaded, not built)");
            }
        }
    }

    private static void checkShape(FactorDefinition def, List<String> problems) {
        Method method = def.method();
        String name = wire(method);
        if (isBlank(def.panel())) {
            problems.add("panel is required for method " + name);
        }
        boolean sorts = method == Method.SORT || method == Method.SIZE_SORT || method == Method.RANK_WEIGHTED;
        if (sorts && def.signal() == null) {
            problems.add("signal is required for method " + name + ": name a numeric column of the panel");
        }
        notFor(!sorts, def.signal(), "signal", "applies to methods sort, size_sort and rank_weighted only", problems);
        boolean rankWeighted = method == Method.RANK_WEIGHTED;
        notFor(rankWeighted, def.weighting(), "weighting", "does not apply to method rank_weighted (weights follow ranks)", problems);
        notFor(rankWeighted, def.breakpoints(), "breakpoints", "does not apply to method rank_weighted (every eligible security is held)", problems);
        checkSortOptions(def, problems);
        notFor(method == Method.MARKET, def.direction(), "direction", "does not apply to method market", problems);
        notFor(method == Method.SIZE_SORT && def.output() == Output.SIZE, def.direction(), "direction",
                "does not apply to output size (it is always small minus big)", problems);
        notFor(method != Method.SORT, def.buckets(), "buckets", "applies to method sort only", problems);
        if (method == Method.SORT && def.buckets() != null
                && (def.buckets() < MIN_BUCKETS || def.buckets() > MAX_BUCKETS)) {
            problems.add("buckets must be between " + MIN_BUCKETS + " and " + MAX_BUCKETS + ", got " + def.buckets());
        }
        if (def.lag() != null && def.lag() < 1) {
            problems.add("lag must be at least 1 (1 forms on the rows of the rebalance date), got " + def.lag());
        }
        checkRebalance(def, problems);
        notFor(method != Method.SIZE_SORT, def.output(), "output", "applies to method size_sort only", problems);
        notFor(method != Method.MARKET, def.riskFree(), "risk_free", "applies to method market only", problems);
        if (def.riskFree() != null && isBlank(def.riskFree())) {
            problems.add("risk_free must name a factor");
        }
        notFor(!sorts || rankWeighted, def.breakpoints(), "breakpoints", "applies to methods sort and size_sort only", problems);
        if (def.breakpoints() != null) {
            checkLabelEquals("breakpoints", def.breakpoints(), problems);
        }
        if (def.costBps() != null && !(def.costBps() >= 0 && Double.isFinite(def.costBps()))) {
            problems.add("cost_bps must be a finite number >= 0, got " + def.costBps());
        }
        checkUniverse(def.effectiveUniverse(), problems);
    }

    /** within and control: sort only, and they exclude each other and breakpoints. */
    private static void checkSortOptions(FactorDefinition def, List<String> problems) {
        boolean sort = def.method() == Method.SORT;
        notFor(!sort, def.within(), "within", "applies to method sort only", problems);
        notFor(!sort, def.control(), "control", "applies to method sort only", problems);
        Object[][] exclusive = {{"within", def.within()}, {"control", def.control()}, {"breakpoints", def.breakpoints()}};
        for (int a = 0; a < exclusive.length; a++) {
            for (int b = a + 1; b < exclusive.length; b++) {
                if (exclusive[a][1] != null && exclusive[b][1] != null) {
                    problems.add("'" + exclusive[a][0] + "' and '" + exclusive[b][0] + "' exclude one another; keep one");
                }
            }
        }
        if (def.within() != null && def.within().isBlank()) {
            problems.add("within must name a label column");
        }
        FactorDefinition.Control control = def.control();
        if (control != null) {
            if (control.buckets() < 2 || control.buckets() > 10) {
                problems.add("control.buckets must be between 2 and 10, got " + control.buckets());
            }
            if (control.signal() == null) {
                problems.add("control.signal is required: a numeric column or a recipe");
            }
        }
    }

    private static void checkRebalance(FactorDefinition def, List<String> problems) {
        Integer month = def.rebalanceMonth();
        if (def.effectiveRebalance() == Rebalance.ANNUAL) {
            if (month == null) {
                problems.add("rebalance annual needs rebalance_month (1 = January ... 12 = December)");
            } else if (month < 1 || month > 12) {
                problems.add("rebalance_month must be between 1 and 12, got " + month);
            }
        } else if (month != null) {
            problems.add("'rebalance_month' applies to rebalance annual only");
        }
    }

    private static void checkUniverse(Universe universe, List<String> problems) {
        Double min = universe.minMarketCap();
        if (min != null && !(min >= 0 && Double.isFinite(min))) {
            problems.add("universe min_market_cap must be a finite number >= 0, got " + min);
        }
        for (Map.Entry<String, LabelFilter> f : universe.labelFilters().entrySet()) {
            if (isBlank(f.getKey())) {
                problems.add("universe label filters need a column name");
            }
            if (f.getValue() == null || f.getValue().mode() == null) {
                problems.add("universe filter on '" + f.getKey() + "' needs include or exclude");
            } else if (f.getValue().values().isEmpty()) {
                problems.add("universe filter on '" + f.getKey() + "' needs at least one value");
            }
        }
        if (universe.segment() != null) {
            checkLabelEquals("universe segment", universe.segment(), problems);
        }
    }

    private static void checkLabelEquals(String field, LabelEquals condition, List<String> problems) {
        if (isBlank(condition.column()) || condition.value() == null) {
            problems.add(field + " needs a label column and the value it must equal");
        }
    }

    private static void checkColumns(FactorDefinition def, PanelSchema schema, List<String> problems) {
        String panel = "panel '" + def.panel() + "'";
        if (def.signal() != null) {
            RecipeJson.check(def.signal(), schema, def.panel(), "signal", problems);
        }
        if (def.control() != null && def.control().signal() != null) {
            RecipeJson.check(def.control().signal(), schema, def.panel(), "control.signal", problems);
        }
        if (def.within() != null) {
            requireLabel("within column", def.within(), schema, panel, problems);
        }
        String capUse = marketCapUse(def);
        if (capUse != null && !schema.hasMarketCap()) {
            problems.add("market_cap is needed for " + capUse + ", but " + panel + " has no market_cap column");
        }
        Universe universe = def.effectiveUniverse();
        for (String column : universe.labelFilters().keySet()) {
            requireLabel("universe filter column", column, schema, panel, problems);
        }
        if (universe.segment() != null) {
            requireLabel("universe segment column", universe.segment().column(), schema, panel, problems);
        }
        if (def.breakpoints() != null) {
            requireLabel("breakpoints column", def.breakpoints().column(), schema, panel, problems);
        }
    }

    private static String marketCapUse(FactorDefinition def) {
        Universe universe = def.effectiveUniverse();
        if (def.method() == Method.SIZE_SORT || def.method() == Method.MARKET) {
            return "method " + wire(def.method());
        } else if (def.effectiveWeighting() == Weighting.CAP) {
            return "cap weighting";
        } else if (universe.minMarketCap() != null) {
            return "universe min_market_cap";
        } else if (universe.sizeHalf() != null) {
            return "universe size_half";
        }
        return null;
    }

    private static void requireLabel(String what, String column, PanelSchema schema, String panel, List<String> problems) {
        if (column != null && !column.isBlank() && !schema.isLabel(column)) {
            List<String> labels = schema.labelColumns();
            problems.add(what + " '" + column + "' is not a label column of " + panel + "; label columns are: "
                    + (labels.isEmpty() ? "(none)" : String.join(", ", labels)));
        }
    }

    private static void notFor(boolean misused, Object value, String field, String rule, List<String> problems) {
        if (misused && value != null) {
            problems.add("'" + field + "' " + rule);
        }
    }

    private static boolean isBlank(String text) {
        return text == null || text.isBlank();
    }

    private static String wire(Method method) {
        return method.name().toLowerCase(Locale.ROOT);
    }
}
