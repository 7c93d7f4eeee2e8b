package dev.winnow.research;

import dev.winnow.construct.BuildResult;
import dev.winnow.construct.CheckpointedBuild;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.EngineState;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorEngine;
import dev.winnow.construct.FormingThreads;
import dev.winnow.construct.Holdings;
import dev.winnow.construct.FactorObservation;
import dev.winnow.construct.PortfolioObservation;
import dev.winnow.construct.Formation;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Replaced;
import dev.winnow.store.FactorStore.StoredBuild;
import dev.winnow.store.FactorStore.StoredPortfolioReturn;
import dev.winnow.store.FactorStore.StoredCheckpoint;
import dev.winnow.store.FactorStore.StoredReturn;
import dev.winnow.store.FactorStore.StoredTurnover;
import dev.winnow.store.JsonText;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorePanelSource;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Builds factor versions from their panels into the store: from scratch, by resuming the stored engine state so that
 * an append costs only the new dates, or, after a revision, by resuming from the last stored checkpoint before the
 * first changed date so that a revision costs the revised span plus at most one checkpoint segment. Each gives the same
 * bits as a full rebuild.
 */
public final class FactorBuilds {
    /**
     * Grid dates between stored checkpoints: about one year of daily dates. A revision recomputes at most this many
     * dates before its first changed date, while a 25-year daily factor keeps only about 25 states, and each segment
     * adds only the re-reading of {@code lag} cross-sections (usually still cached) to a full build.
     */
    static final int CHECKPOINT_DATES = 252;

    private final PanelStore panels;
    private final FactorStore factors;
    private final FormingThreads forming;
    private final int checkpointDates;

    /** @param forming the threads a build forms ahead on, shared with the service */
    public FactorBuilds(PanelStore panels, FactorStore factors, FormingThreads forming) {
        this(panels, factors, forming, CHECKPOINT_DATES);
    }

    /** With another checkpoint spacing, so tests can have several checkpoints on a short panel. */
    FactorBuilds(PanelStore panels, FactorStore factors, FormingThreads forming, int checkpointDates) {
        if (checkpointDates < 1) {
            throw new IllegalArgumentException("checkpoint spacing must be at least 1 grid date, got " + checkpointDates);
        }
        this.panels = panels;
        this.factors = factors;
        this.forming = java.util.Objects.requireNonNull(forming, "forming");
        this.checkpointDates = checkpointDates;
    }

    /** Thrown when a version cannot be built as defined (its panel or risk-free series is missing, say). */
    public static final class FactorBuildException extends Exception {
        public FactorBuildException(String message) {
            super(message);
        }
    }

    /** Rebuilds the whole series of a version, replacing what was stored. Returns the build report. */
    public BuildReport rebuild(FactorVersionRecord v) throws FactorBuildException {
        FactorDefinition def = definition(v);
        CheckpointedBuild.Result run = CheckpointedBuild.run(def, panelSource(v, def), riskFree(def), signalFactors(def), null, 0, 0, checkpointDates, forming);
        BuildReport report = report(run.build(), 0, 0);
        save(v, run, report, Replaced.EVERYTHING);
        return report;
    }

    /** What {@link #rebuildTogether} did with one version: its build report, or why it failed (report null). */
    public record TogetherOutcome(FactorVersionRecord version, BuildReport report, String error) {
    }

    /**
     * Rebuilds several versions from scratch sharing the passes over their panels: the versions of one panel are
     * built in one pass that reads each cross-section once and evaluates each distinct signal recipe once
     * ({@link FactorEngine#buildTogether}); each result is the same as {@link #rebuild} of that version alone. A version
     * whose inputs are missing (its panel, risk-free or signal factor) fails alone.
     *
     * @param progress called with the fraction (0..1] of grid dates processed over all panels
     */
    public List<TogetherOutcome> rebuildTogether(List<FactorVersionRecord> versions, java.util.function.DoubleConsumer progress) {
        List<TogetherOutcome> out = new ArrayList<>();
        Map<Long, List<FactorVersionRecord>> byPanel = new LinkedHashMap<>();
        Map<Long, List<FactorEngine.Member>> members = new LinkedHashMap<>();
        Map<Long, java.util.Set<String>> columns = new LinkedHashMap<>();
        for (FactorVersionRecord v : versions) {
            try {
                FactorDefinition def = definition(v);
                panelSource(v, def);
                columns.computeIfAbsent(v.panelId(), k -> new java.util.TreeSet<>()).addAll(def.columnsRead());
                FactorEngine.Member m = new FactorEngine.Member(def, riskFree(def), signalFactors(def));
                byPanel.computeIfAbsent(v.panelId(), k -> new ArrayList<>()).add(v);
                members.computeIfAbsent(v.panelId(), k -> new ArrayList<>()).add(m);
            } catch (FactorBuildException | IllegalArgumentException e) {
                out.add(new TogetherOutcome(v, null, e.getMessage()));
            }
        }
        long totalDates = 0;
        Map<Long, StorePanelSource> sources = new LinkedHashMap<>();
        for (Long panelId : byPanel.keySet()) {
            StorePanelSource source = panels.source(panelId, columns.get(panelId)::contains);
            sources.put(panelId, source);
            totalDates += source.dates().size();
        }
        long[] done = {0};
        long total = Math.max(1, totalDates);
        for (Long panelId : byPanel.keySet()) {
            long before = done[0];
            List<CheckpointedBuild.Result> results = FactorEngine.buildTogether(members.get(panelId), sources.get(panelId),
                    checkpointDates, t -> {
                        if (progress != null) {
                            progress.accept((before + t) / (double) total);
                        }
                    });
            done[0] += sources.get(panelId).dates().size();
            List<FactorVersionRecord> list = byPanel.get(panelId);
            for (int i = 0; i < list.size(); i++) {
                BuildReport report = report(results.get(i).build(), 0, 0);
                save(list.get(i), results.get(i), report, Replaced.EVERYTHING);
                out.add(new TogetherOutcome(list.get(i), report, null));
            }
        }
        return out;
    }

    /** Extends a version over dates appended to its panel, from its stored engine state. */
    public BuildReport extend(FactorVersionRecord v) throws FactorBuildException {
        byte[] stateBytes = factors.engineState(v.factorId(), v.version());
        if (stateBytes == null) {
            return rebuild(v);
        }
        FactorDefinition def = definition(v);
        EngineState state = EngineState.fromBytes(stateBytes);
        Map<String, Object> previous = v.buildReport() == null ? Map.of() : JsonText.readMap(v.buildReport());
        int previousMissing = ((Number) previous.getOrDefault("periods_without_return", 0)).intValue();
        int previousObservations = ((Number) previous.getOrDefault("observations", 0)).intValue();
        CheckpointedBuild.Result run = CheckpointedBuild.run(def, panelSource(v, def), riskFree(def), signalFactors(def), state,
                previousObservations, previousMissing, checkpointDates, forming);
        BuildReport report = report(run.build(), previousObservations, previousMissing);
        save(v, run, report, Replaced.NOTHING);
        return report;
    }

    /**
     * Brings a version up to date after its panel's or risk-free series' data changed on or after
     * {@code earliestChanged} (null: anywhere): resumes from the latest checkpoint whose last date is before it and
     * whose grid position still holds (a revision may add dates, never remove them), and replaces what follows it in
     * one transaction. Without such a checkpoint, rebuilds from scratch. The report adds {@code rebuilt_from} (the
     * checkpoint's date, null for a full rebuild) and {@code recomputed_dates}.
     */
    public BuildReport rebuildFrom(FactorVersionRecord v, LocalDate earliestChanged) throws FactorBuildException {
        FactorDefinition def = definition(v);
        StorePanelSource panel = panelSource(v, def);
        StoredCheckpoint checkpoint = earliestChanged == null ? null
                : factors.latestCheckpointBefore(v.factorId(), v.version(), earliestChanged)
                        .filter(c -> resumable(c, def, panel.dates()))
                        .orElse(null);
        if (checkpoint == null) {
            return rebuild(v).restartedAt(null, panel.dates().size());
        }
        CheckpointedBuild.Result run = CheckpointedBuild.run(def, panel, riskFree(def), signalFactors(def), EngineState.fromBytes(checkpoint.state()),
                checkpoint.observations(), checkpoint.periodsWithoutReturn(), checkpointDates, forming);
        BuildReport report = report(run.build(), checkpoint.observations(), checkpoint.periodsWithoutReturn())
                .restartedAt(checkpoint.lastDate(), panel.dates().size() - checkpoint.processedDates());
        save(v, run, report, Replaced.after(checkpoint));
        return report;
    }

    /**
     * Brings every version up to date after its panel's data changed on or after {@code earliestChanged}, each as
     * {@link #rebuildFrom} would, in the given order (dependencies first); except that the versions {@link #rebuildFrom}
     * would rebuild from scratch and that read no other factor's series (no risk-free rate, no factor in their recipe)
     * are rebuilt together first, in one pass over their panel ({@link #rebuildTogether}: each cross-section read and
     * decoded once for all of them instead of once each). A revision of a panel's first date is such a case for every
     * factor on it. Each outcome holds its version's report, or the error that kept it from being built.
     */
    public List<TogetherOutcome> rebuildAllFrom(List<FactorVersionRecord> versions, LocalDate earliestChanged) {
        List<FactorVersionRecord> together = new ArrayList<>();
        Map<FactorVersionRecord, Integer> dateCounts = new java.util.HashMap<>();
        for (FactorVersionRecord v : versions) {
            try {
                FactorDefinition def = definition(v);
                if (def.riskFree() != null || !def.recipeFactors().isEmpty()) {
                    continue;
                }
                StorePanelSource panel = panelSource(v, def);
                boolean resumes = earliestChanged != null && factors.latestCheckpointBefore(v.factorId(), v.version(), earliestChanged)
                        .filter(c -> resumable(c, def, panel.dates())).isPresent();
                if (!resumes) {
                    together.add(v);
                    dateCounts.put(v, panel.dates().size());
                }
            } catch (FactorBuildException | IllegalArgumentException e) {
                // left to rebuildFrom below, which reports it
            }
        }
        Map<FactorVersionRecord, TogetherOutcome> done = new java.util.HashMap<>();
        if (together.size() > 1) {
            for (TogetherOutcome o : rebuildTogether(together, null)) {
                if (o.report() != null) {
                    o = new TogetherOutcome(o.version(), o.report().restartedAt(null, dateCounts.get(o.version())), null);
                }
                done.put(o.version(), o);
            }
        }
        List<TogetherOutcome> out = new ArrayList<>(versions.size());
        for (FactorVersionRecord v : versions) {
            TogetherOutcome o = done.get(v);
            if (o == null) {
                try {
                    o = new TogetherOutcome(v, rebuildFrom(v, earliestChanged), null);
                } catch (FactorBuildException | IllegalArgumentException e) {
                    o = new TogetherOutcome(v, null, e.getMessage());
                }
            }
            out.add(o);
        }
        return out;
    }

    /**
     * What a version holds at grid date {@code dateIndex} (see {@link FactorEngine#holdings}), replayed from the latest
     * stored checkpoint at or before its latest formation (from the first date without one); null when no formation
     * happened by then.
     */
    public Holdings holdings(FactorVersionRecord v, int dateIndex) throws FactorBuildException {
        FactorDefinition def = definition(v);
        StorePanelSource panel = panelSource(v, def);
        int formation = FactorEngine.latestFormation(def, panel.dates(), dateIndex);
        if (formation < 0) {
            return null;
        }
        StoredCheckpoint start = null;
        for (StoredCheckpoint c : factors.checkpoints(v.factorId(), v.version())) {
            if (c.processedDates() <= formation + 1 && resumable(c, def, panel.dates())) {
                start = c;
            }
        }
        return FactorEngine.holdings(def, panel, riskFree(def), signalFactors(def),
                start == null ? null : EngineState.fromBytes(start.state()), dateIndex);
    }

    /** The grid of a version's panel. */
    public List<LocalDate> grid(FactorVersionRecord v) throws FactorBuildException {
        return panelSource(v, definition(v)).dates();
    }

    /** Whether the checkpoint still sits at its grid position and belongs to this definition. */
    private static boolean resumable(StoredCheckpoint c, FactorDefinition def, List<LocalDate> dates) {
        int k = c.processedDates();
        if (k < 1 || k > dates.size() || !dates.get(k - 1).equals(c.lastDate())) {
            return false;
        }
        try {
            return EngineState.fromBytes(c.state()).definitionKey().equals(def.constructionKey());
        } catch (IllegalArgumentException unreadable) {
            return false;
        }
    }

    private void save(FactorVersionRecord v, CheckpointedBuild.Result run, BuildReport report, Replaced replaced) {
        BuildResult result = run.build();
        List<StoredCheckpoint> checkpoints = new ArrayList<>(run.checkpoints().size());
        for (CheckpointedBuild.Checkpoint c : run.checkpoints()) {
            checkpoints.add(new StoredCheckpoint(c.state().processedDates(), c.state().lastProcessedDate(), c.observations(),
                    c.periodsWithoutReturn(), c.state().toBytes()));
        }
        factors.saveBuild(v.factorId(), v.version(), new StoredBuild(toStored(result.observations()),
                toStoredTurnover(result.formations()), checkpoints, result.endState().toBytes(), JsonText.write(report),
                toStoredPortfolios(FactorEngine.portfolioNames(definition(v)), result.portfolioObservations())), replaced);
    }

    /** One row per portfolio and date with a return (a NaN portfolio return is no row). */
    private static List<StoredPortfolioReturn> toStoredPortfolios(List<String> names, List<PortfolioObservation> observations) {
        List<StoredPortfolioReturn> out = new ArrayList<>(observations.size() * names.size());
        for (PortfolioObservation o : observations) {
            for (int k = 0; k < names.size(); k++) {
                double r = o.returnOf(k);
                if (!Double.isNaN(r)) {
                    out.add(new StoredPortfolioReturn(o.date(), names.get(k), r));
                }
            }
        }
        return out;
    }

    /** The build report: counts over the whole series, the ones before this run given. */
    private static BuildReport report(BuildResult result, int observationsBefore, int missingBefore) {
        return new BuildReport(observationsBefore + result.observations().size(), missingBefore + result.periodsWithoutReturn(),
                result.observations().size(), result.formations().size(), null);
    }

    /** The version's panel, decoding only the columns the definition reads. */
    private StorePanelSource panelSource(FactorVersionRecord v, FactorDefinition def) throws FactorBuildException {
        if (v.panelId() == null) {
            throw new FactorBuildException("factor '" + v.name() + "' has no panel to build from");
        }
        return panels.source(v.panelId(), def.columnsRead()::contains);
    }

    private ReturnSeries riskFree(FactorDefinition def) throws FactorBuildException {
        if (def.riskFree() == null) {
            return null;
        }
        FactorVersionRecord rf = factors.current(def.riskFree())
                .orElseThrow(() -> new FactorBuildException("risk_free factor '" + def.riskFree() + "' does not exist; define and upload it first"));
        return factors.series(rf.factorId(), rf.version(), FactorStore.Leg.SPREAD);
    }

    /** The spread series of every factor the signal recipe reads (trailing_beta's {@code against}), current versions. */
    public Map<String, ReturnSeries> signalFactors(FactorDefinition def) throws FactorBuildException {
        Map<String, ReturnSeries> out = new LinkedHashMap<>();
        for (String name : def.recipeFactors()) {
            FactorVersionRecord f = factors.current(name).orElseThrow(() -> new FactorBuildException(
                    "the signal reads factor '" + name + "', which does not exist; define it first"));
            out.put(name, factors.series(f.factorId(), f.version(), FactorStore.Leg.SPREAD));
        }
        return out;
    }

    /** Whether a definition reads the named factor: as its risk_free rate or inside its signal recipe. */
    public static boolean dependsOn(FactorDefinition def, String factor) {
        return def.factorsRead().contains(factor);
    }

    /**
     * The versions reordered so that each comes after the versions in the list it reads (risk_free or signal
     * factors), otherwise in the given order: extending a panel's factors in this order gives every dependent its
     * dependency's new dates. Definitions cannot form cycles (refused when declared).
     */
    public static List<FactorVersionRecord> dependenciesFirst(List<FactorVersionRecord> versions) {
        Map<String, FactorVersionRecord> byName = new LinkedHashMap<>();
        versions.forEach(v -> byName.put(v.name(), v));
        List<FactorVersionRecord> out = new ArrayList<>();
        java.util.Set<String> placed = new java.util.HashSet<>();
        for (FactorVersionRecord v : versions) {
            place(v, byName, placed, new java.util.HashSet<>(), out);
        }
        return out;
    }

    private static void place(FactorVersionRecord v, Map<String, FactorVersionRecord> byName, java.util.Set<String> placed,
                              java.util.Set<String> visiting, List<FactorVersionRecord> out) {
        if (placed.contains(v.name()) || !visiting.add(v.name())) {
            return;
        }
        if (v.method() != FactorDefinition.Method.EXTERNAL) {
            FactorDefinition def = definition(v);
            for (String name : def.factorsRead()) {
                FactorVersionRecord dependency = byName.get(name);
                if (dependency != null) {
                    place(dependency, byName, placed, visiting, out);
                }
            }
        }
        placed.add(v.name());
        out.add(v);
    }

    public static FactorDefinition definition(FactorVersionRecord v) {
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
