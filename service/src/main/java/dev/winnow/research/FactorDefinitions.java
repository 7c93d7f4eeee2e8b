package dev.winnow.research;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.DefinitionValidator;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.PanelSchema;
import dev.winnow.construct.Recipe;
import dev.winnow.construct.RecipeJson;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.DefineOutcome;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Declaring a factor: reads and checks the definition against its panel, records a new version when it changed and
 * queues its build. Used by the HTTP API and by the demo loader alike.
 */
public final class FactorDefinitions {
    private final FactorStore factors;
    private final PanelStore panels;
    private final WorkQueue queue;

    public FactorDefinitions(FactorStore factors, PanelStore panels, WorkQueue queue) {
        this.factors = factors;
        this.panels = panels;
        this.queue = queue;
    }

    /** The definition cannot be accepted; every problem is listed. */
    public static final class InvalidDefinitionException extends Exception {
        private final List<String> problems;

        public InvalidDefinitionException(List<String> problems) {
            super(String.join("; ", problems));
            this.problems = List.copyOf(problems);
        }

        public List<String> problems() {
            return problems;
        }
    }

    /** What a definition led to: the version, whether it is new, and the build job (null when none was needed). */
    public record Defined(FactorVersionRecord version, boolean created, Long buildJob) {
    }

    public Defined define(String name, JsonNode body) throws InvalidDefinitionException {
        DefineOutcome outcome = record(name, check(name, body));
        FactorVersionRecord v = outcome.version();
        if (!outcome.created()) {
            return new Defined(v, false, null);
        }
        if (v.method() == Method.EXTERNAL) {
            factors.saveBuild(v.factorId(), v.version(), List.of(), List.of(), null, null, true, null);
            return new Defined(factors.version(name, v.version()).orElseThrow(), true, null);
        }
        return new Defined(v, true, queue.queueFactorBuild(name, v.version()));
    }

    /** A definition checked against its panel and the factors it reads, ready to be recorded. */
    public record Checked(FactorDefinition definition, Long panelId) {
    }

    /** Reads and checks a definition for factor {@code name}; every problem is listed. */
    public Checked check(String name, JsonNode body) throws InvalidDefinitionException {
        List<String> tooLong = DefinitionTextLimits.problems(body);
        if (!tooLong.isEmpty()) {
            throw new InvalidDefinitionException(tooLong);
        }
        DefinitionJson.Parsed parsed = DefinitionJson.read(body);
        if (!parsed.ok()) {
            throw new InvalidDefinitionException(parsed.problems());
        }
        FactorDefinition def = parsed.definition();
        Long panelId = null;
        PanelSchema schema = null;
        List<String> problems = new ArrayList<>();
        if (def.method() != Method.EXTERNAL && def.panel() != null) {
            PanelRecord panel = panels.find(def.panel()).filter(PanelRecord::visible).orElse(null);
            if (panel == null) {
                throw new InvalidDefinitionException(List.of("unknown panel '" + def.panel() + "'; upload it first"));
            }
            panelId = panel.id();
            schema = schemaOf(panels.columns(panel.id()));
        }
        problems.addAll(DefinitionValidator.validate(def, schema));
        if (def.riskFree() != null && def.riskFree().equals(name)) {
            problems.add("risk_free cannot name the factor itself");
        } else if (def.riskFree() != null && factors.current(def.riskFree()).isEmpty()) {
            problems.add("risk_free names factor '" + def.riskFree() + "', which does not exist; define and upload it first");
        } else if (def.riskFree() != null && reads(def.riskFree(), name, new java.util.HashSet<>())) {
            problems.add("risk_free: factor '" + def.riskFree() + "' reads '" + name + "' itself (through its risk_free or signal),"
                    + " so this would be a cycle");
        }
        if (def.signal() != null) {
            checkSignalFactors(name, def.signal(), "signal", problems);
        }
        if (def.control() != null && def.control().signal() != null) {
            checkSignalFactors(name, def.control().signal(), "control.signal", problems);
        }
        if (!problems.isEmpty()) {
            throw new InvalidDefinitionException(problems);
        }
        String canonical = DefinitionJson.toCanonicalString(def);
        if (canonical.length() > dev.winnow.store.Limits.MAX_DEFINITION_CHARS) {
            throw new InvalidDefinitionException(List.of("the definition is " + canonical.length() + " characters long once "
                    + "written out; at most " + dev.winnow.store.Limits.MAX_DEFINITION_CHARS + " are kept: shorten the rationale or the signal"));
        }
        return new Checked(def, panelId);
    }

    /** Records a checked definition: a new version when it differs from the current one (no build is queued). */
    public DefineOutcome record(String name, Checked checked) {
        FactorDefinition def = checked.definition();
        return factors.define(name, DefinitionJson.toCanonicalString(def), def.method(), checked.panelId());
    }

    /**
     * Every factor a recipe reads must exist, and the factor may not read itself, directly or through the factors it
     * reads (their risk_free rates and signal recipes).
     */
    private void checkSignalFactors(String name, Recipe signal, String root, List<String> problems) {
        RecipeJson.walk(signal, root, (recipe, path) -> {
            if (!(recipe instanceof Recipe.TrailingBeta beta)) {
                return;
            }
            String against = beta.against();
            String at = path + ".trailing_beta.against";
            if (against.equals(name)) {
                problems.add(at + ": a factor cannot read its own returns");
            } else if (factors.current(against).isEmpty()) {
                problems.add(at + ": no factor '" + against + "'; define it first");
            } else if (reads(against, name, new java.util.HashSet<>())) {
                problems.add(at + ": factor '" + against + "' reads '" + name + "' itself (through its risk_free or signal),"
                        + " so this would be a cycle");
            }
        });
    }

    /** Whether factor {@code from}'s current definition reads {@code target}, directly or transitively. */
    private boolean reads(String from, String target, java.util.Set<String> seen) {
        if (!seen.add(from)) {
            return false;
        }
        FactorVersionRecord v = factors.current(from).orElse(null);
        if (v == null || v.method() == Method.EXTERNAL) {
            return false;
        }
        FactorDefinition def = FactorBuilds.definition(v);
        for (String n : def.factorsRead()) {
            if (n.equals(target) || reads(n, target, seen)) {
                return true;
            }
        }
        return false;
    }

    /** The construction engine's view of a panel's stored columns. */
    public static PanelSchema schemaOf(Map<String, String> columns) {
        Map<String, PanelSchema.ColumnType> types = new HashMap<>();
        columns.forEach((column, type) -> {
            if (!column.equals("market_cap")) {
                types.put(column, type.equals("number") ? PanelSchema.ColumnType.NUMBER : PanelSchema.ColumnType.LABEL);
            }
        });
        return new PanelSchema(types, columns.containsKey("market_cap"));
    }
}
