package dev.winnow.ingest;

import dev.winnow.construct.BuildResult;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.EngineState;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorEngine;
import dev.winnow.construct.FactorObservation;
import dev.winnow.construct.Formation;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.StoredReturn;
import dev.winnow.store.FactorStore.StoredTurnover;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorePanelSource;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Builds factor versions from their panels into the store: from scratch, or by resuming the stored engine state
 * so that an append costs only the new dates (and gives the same bits as a full rebuild).
 */
public final class FactorBuilds {
    private final PanelStore panels;
    private final FactorStore factors;

    public FactorBuilds(PanelStore panels, FactorStore factors) {
        this.panels = panels;
        this.factors = factors;
    }

    /** Thrown when a version cannot be built as defined (its panel or risk-free series is missing, say). */
    public static final class FactorBuildException extends Exception {
        public FactorBuildException(String message) {
            super(message);
        }
    }

    /** Rebuilds the whole series of a version, replacing what was stored. Returns the build report. */
    public Map<String, Object> rebuild(FactorVersionRecord v) throws FactorBuildException {
        FactorDefinition def = definition(v);
        BuildResult result = FactorEngine.build(def, panelSource(v), riskFree(def), null);
        Map<String, Object> report = report(result, 0, result.observations().size());
        factors.saveBuild(v.factorId(), v.version(), toStored(result.observations()), toStoredTurnover(result.formations()),
                result.endState().toBytes(), JsonText.write(report), false, null);
        return report;
    }

    /** Extends a version over dates appended to its panel, from its stored engine state. */
    public Map<String, Object> extend(FactorVersionRecord v) throws FactorBuildException {
        byte[] stateBytes = factors.engineState(v.factorId(), v.version());
        if (stateBytes == null) {
            return rebuild(v);
        }
        FactorDefinition def = definition(v);
        EngineState state = EngineState.fromBytes(stateBytes);
        BuildResult result = FactorEngine.build(def, panelSource(v), riskFree(def), state);
        Map<String, Object> previous = v.buildReport() == null ? Map.of() : JsonText.readMap(v.buildReport());
        int previousMissing = ((Number) previous.getOrDefault("periods_without_return", 0)).intValue();
        int previousObservations = ((Number) previous.getOrDefault("observations", 0)).intValue();
        Map<String, Object> report = report(result, previousMissing, previousObservations + result.observations().size());
        factors.saveBuild(v.factorId(), v.version(), toStored(result.observations()), toStoredTurnover(result.formations()),
                result.endState().toBytes(), JsonText.write(report), true, null);
        return report;
    }

    private static Map<String, Object> report(BuildResult result, int previousMissing, int observations) {
        Map<String, Object> report = new LinkedHashMap<>();
        report.put("observations", observations);
        report.put("periods_without_return", previousMissing + result.periodsWithoutReturn());
        report.put("new_observations", result.observations().size());
        report.put("new_formations", result.formations().size());
        return report;
    }

    private StorePanelSource panelSource(FactorVersionRecord v) throws FactorBuildException {
        if (v.panelId() == null) {
            throw new FactorBuildException("factor '" + v.name() + "' has no panel to build from");
        }
        return new StorePanelSource(panels, v.panelId());
    }

    private ReturnSeries riskFree(FactorDefinition def) throws FactorBuildException {
        if (def.riskFree() == null) {
            return null;
        }
        FactorVersionRecord rf = factors.current(def.riskFree())
                .orElseThrow(() -> new FactorBuildException("risk_free factor '" + def.riskFree() + "' does not exist; define and upload it first"));
        return factors.series(rf.factorId(), rf.version(), FactorStore.Leg.SPREAD);
    }

    static FactorDefinition definition(FactorVersionRecord v) {
        DefinitionJson.Parsed parsed = DefinitionJson.read(v.definitionJson());
        if (!parsed.ok()) {
            throw new IllegalStateException("stored definition of " + v.name() + " v" + v.version() + " is unreadable: " + parsed.problems());
        }
        return parsed.definition();
    }

    private static List<StoredReturn> toStored(List<FactorObservation> observations) {
        List<StoredReturn> out = new ArrayList<>(observations.size());
        for (FactorObservation o : observations) {
            out.add(new StoredReturn(o.date(), o.spread(), o.longLeg(), o.shortLeg(), o.net()));
        }
        return out;
    }

    private static List<StoredTurnover> toStoredTurnover(List<Formation> formations) {
        List<StoredTurnover> out = new ArrayList<>(formations.size());
        for (Formation f : formations) {
            out.add(new StoredTurnover(f.date(), f.turnover()));
        }
        return out;
    }
}
