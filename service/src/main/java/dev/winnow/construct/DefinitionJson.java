package dev.winnow.construct;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.construct.FactorDefinition.Rebalance;
import dev.winnow.construct.FactorDefinition.Role;
import dev.winnow.construct.FactorDefinition.Weighting;

import java.io.IOException;
import java.time.LocalDate;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * The wire form of a {@link FactorDefinition}: snake_case JSON as sent to {@code PUT /v1/factors/{f}}, and the
 * canonical JSON kept with each version (fields in one fixed order, only those that were given).
 * Reading collects every problem instead of stopping at the first.
 */
public final class DefinitionJson {
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final Set<String> FIELDS = Set.of("panel", "method", "signal", "direction", "buckets", "weighting", "lag",
            "rebalance", "rebalance_month", "output", "risk_free", "universe", "breakpoints", "within", "control", "cost_bps", "theme",
            "rationale", "found_on", "role");

    private DefinitionJson() {
    }

    /** A definition read from JSON, or the problems that kept it from being read. */
    public record Parsed(FactorDefinition definition, List<String> problems) {
        public boolean ok() {
            return problems.isEmpty();
        }
    }

    public static Parsed read(JsonNode node) {
        List<String> problems = new ArrayList<>();
        if (node == null || !node.isObject()) {
            return new Parsed(null, List.of("the definition must be a JSON object"));
        }
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String name = it.next();
            if (!FIELDS.contains(name)) {
                problems.add("unknown field '" + name + "'; known fields are " + new java.util.TreeSet<>(FIELDS));
            }
        }
        Method method = enumField(node, "method", Method.class, problems);
        if (method == null && !node.hasNonNull("method")) {
            problems.add("method is required: one of sort, size_sort, market, rank_weighted, external");
        }
        FactorDefinition.Builder b = FactorDefinition.builder(method)
                .panel(text(node, "panel", problems))
                .signal(node.hasNonNull("signal") ? RecipeJson.read(node.get("signal"), "signal", problems) : null)
                .direction(enumField(node, "direction", Direction.class, problems))
                .buckets(integer(node, "buckets", problems))
                .weighting(enumField(node, "weighting", Weighting.class, problems))
                .lag(integer(node, "lag", problems))
                .rebalance(enumField(node, "rebalance", Rebalance.class, problems))
                .rebalanceMonth(integer(node, "rebalance_month", problems))
                .output(enumField(node, "output", Output.class, problems))
                .riskFree(text(node, "risk_free", problems))
                .universe(universe(node.get("universe"), problems))
                .breakpoints(breakpoints(node.get("breakpoints"), problems))
                .within(text(node, "within", problems))
                .control(control(node.get("control"), problems))
                .costBps(number(node, "cost_bps", problems))
                .theme(text(node, "theme", problems))
                .rationale(text(node, "rationale", problems))
                .foundOn(date(node, "found_on", problems))
                .role(enumField(node, "role", Role.class, problems));
        if (!problems.isEmpty()) {
            return new Parsed(null, problems);
        }
        return new Parsed(b.build(), List.of());
    }

    public static Parsed read(String json) {
        try {
            return read(MAPPER.readTree(json));
        } catch (IOException e) {
            return new Parsed(null, List.of("not valid JSON: " + e.getMessage()));
        }
    }

    /** Canonical JSON: only the given fields, in a fixed order, enums in lower case. */
    public static ObjectNode toJson(FactorDefinition d) {
        ObjectNode o = MAPPER.createObjectNode();
        putText(o, "method", wire(d.method()));
        putText(o, "panel", d.panel());
        if (d.signal() != null) {
            o.set("signal", signalJson(d.signal()));
        }
        putText(o, "direction", wire(d.direction()));
        putInt(o, "buckets", d.buckets());
        putText(o, "weighting", wire(d.weighting()));
        putInt(o, "lag", d.lag());
        putText(o, "rebalance", wire(d.rebalance()));
        putInt(o, "rebalance_month", d.rebalanceMonth());
        putText(o, "output", wire(d.output()));
        putText(o, "risk_free", d.riskFree());
        if (d.universe() != null) {
            o.set("universe", universeJson(d.universe()));
        }
        if (d.breakpoints() != null) {
            ObjectNode bp = o.putObject("breakpoints");
            bp.put("column", d.breakpoints().column());
            bp.put("equals", d.breakpoints().value());
        }
        putText(o, "within", d.within());
        if (d.control() != null) {
            ObjectNode c = o.putObject("control");
            c.put("buckets", d.control().buckets());
            c.set("signal", signalJson(d.control().signal()));
        }
        if (d.costBps() != null) {
            o.put("cost_bps", d.costBps());
        }
        putText(o, "theme", d.theme());
        putText(o, "rationale", d.rationale());
        putText(o, "found_on", d.foundOn() == null ? null : d.foundOn().toString());
        putText(o, "role", wire(d.role()));
        return o;
    }

    public static String toCanonicalString(FactorDefinition d) {
        return toJson(d).toString();
    }

    /** A plain column stays a string (as stored before recipes); a recipe is written in its canonical form. */
    private static JsonNode signalJson(Recipe signal) {
        return signal.columnName() != null ? MAPPER.getNodeFactory().textNode(signal.columnName()) : RecipeJson.toJson(signal);
    }

    private static FactorDefinition.Control control(JsonNode node, List<String> problems) {
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isObject() || !node.has("signal") || !node.has("buckets") || node.size() != 2) {
            problems.add("control must be {\"signal\": <column or recipe>, \"buckets\": 2..10}");
            return null;
        }
        Recipe signal = RecipeJson.read(node.get("signal"), "control.signal", problems);
        JsonNode b = node.get("buckets");
        if (!b.isIntegralNumber() || !b.canConvertToInt()) {
            problems.add("control.buckets must be a whole number from 2 to 10, got " + b);
            return null;
        }
        return signal == null ? null : new FactorDefinition.Control(signal, b.asInt());
    }

    private static ObjectNode universeJson(Universe u) {
        ObjectNode o = MAPPER.createObjectNode();
        if (u.minMarketCap() != null) {
            o.put("min_market_cap", u.minMarketCap());
        }
        if (!u.labelFilters().isEmpty()) {
            ObjectNode labels = o.putObject("labels");
            u.labelFilters().forEach((column, filter) -> {
                ArrayNode values = labels.putObject(column).putArray(filter.mode() == LabelFilter.Mode.INCLUDE ? "include" : "exclude");
                filter.values().forEach(values::add);
            });
        }
        return o;
    }

    /**
     * A {@code universe} object as definitions spell it (min_market_cap, labels), for the studies that take one; null
     * when the node is absent. Problems are added to {@code problems}.
     */
    public static Universe readUniverse(JsonNode node, List<String> problems) {
        return universe(node, problems);
    }

    private static Universe universe(JsonNode node, List<String> problems) {
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isObject()) {
            problems.add("universe must be an object with min_market_cap and/or labels");
            return null;
        }
        Universe u = Universe.ALL;
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String name = it.next();
            if (!name.equals("min_market_cap") && !name.equals("labels")) {
                problems.add("unknown field 'universe." + name + "'; use min_market_cap and labels");
            }
        }
        JsonNode min = node.get("min_market_cap");
        if (min != null && !min.isNull()) {
            if (!min.isNumber() || !Double.isFinite(min.asDouble()) || min.asDouble() < 0) {
                problems.add("universe.min_market_cap must be a number at or above 0");
            } else {
                u = u.withMinMarketCap(min.asDouble());
            }
        }
        JsonNode labels = node.get("labels");
        if (labels != null && !labels.isNull()) {
            if (!labels.isObject()) {
                problems.add("universe.labels must map a label column to {\"include\":[...]} or {\"exclude\":[...]}");
                return u;
            }
            for (Iterator<Map.Entry<String, JsonNode>> it = labels.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                LabelFilter filter = labelFilter(e.getKey(), e.getValue(), problems);
                if (filter != null) {
                    u = u.withLabelFilter(e.getKey(), filter);
                }
            }
        }
        return u;
    }

    private static LabelFilter labelFilter(String column, JsonNode node, List<String> problems) {
        String where = "universe.labels." + column;
        if (!node.isObject() || node.size() != 1 || !(node.has("include") || node.has("exclude"))) {
            problems.add(where + " must be {\"include\":[...]} or {\"exclude\":[...]}");
            return null;
        }
        boolean include = node.has("include");
        JsonNode values = node.get(include ? "include" : "exclude");
        if (!values.isArray() || values.isEmpty()) {
            problems.add(where + " needs a non-empty array of label values");
            return null;
        }
        List<String> list = new ArrayList<>();
        for (JsonNode v : values) {
            if (!v.isTextual()) {
                problems.add(where + " values must be strings");
                return null;
            }
            list.add(v.asText());
        }
        return new LabelFilter(include ? LabelFilter.Mode.INCLUDE : LabelFilter.Mode.EXCLUDE, list);
    }

    private static LabelEquals breakpoints(JsonNode node, List<String> problems) {
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isObject() || !node.path("column").isTextual() || !node.path("equals").isTextual() || node.size() != 2) {
            problems.add("breakpoints must be {\"column\":\"<label column>\",\"equals\":\"<value>\"}");
            return null;
        }
        return new LabelEquals(node.get("column").asText(), node.get("equals").asText());
    }

    private static String text(JsonNode node, String field, List<String> problems) {
        JsonNode v = node.get(field);
        if (v == null || v.isNull()) {
            return null;
        }
        if (!v.isTextual() || v.asText().isBlank()) {
            problems.add(field + " must be a non-empty string");
            return null;
        }
        return v.asText();
    }

    private static Integer integer(JsonNode node, String field, List<String> problems) {
        JsonNode v = node.get(field);
        if (v == null || v.isNull()) {
            return null;
        }
        if (!v.isIntegralNumber() || !v.canConvertToInt()) {
            problems.add(field + " must be a whole number");
            return null;
        }
        return v.asInt();
    }

    private static Double number(JsonNode node, String field, List<String> problems) {
        JsonNode v = node.get(field);
        if (v == null || v.isNull()) {
            return null;
        }
        if (!v.isNumber() || !Double.isFinite(v.asDouble())) {
            problems.add(field + " must be a finite number");
            return null;
        }
        return v.asDouble();
    }

    private static LocalDate date(JsonNode node, String field, List<String> problems) {
        String text = text(node, field, problems);
        if (text == null) {
            return null;
        }
        try {
            return LocalDate.parse(text);
        } catch (DateTimeParseException e) {
            problems.add(field + " must be a date yyyy-mm-dd, got '" + text + "'");
            return null;
        }
    }

    private static <E extends Enum<E>> E enumField(JsonNode node, String field, Class<E> type, List<String> problems) {
        String text = text(node, field, problems);
        if (text == null) {
            return null;
        }
        for (E e : type.getEnumConstants()) {
            if (wire(e).equals(text)) {
                return e;
            }
        }
        List<String> allowed = new ArrayList<>();
        for (E e : type.getEnumConstants()) {
            allowed.add(wire(e));
        }
        problems.add(field + " '" + text + "' is not one of " + allowed);
        return null;
    }

    /** Wire spelling of an enum constant: lower case, as in {@code high_minus_low}. */
    public static String wire(Enum<?> e) {
        return e == null ? null : e.name().toLowerCase(Locale.ROOT);
    }

    private static void putText(ObjectNode o, String field, String value) {
        if (value != null) {
            o.put(field, value);
        }
    }

    private static void putInt(ObjectNode o, String field, Integer value) {
        if (value != null) {
            o.put(field, value);
        }
    }

}
