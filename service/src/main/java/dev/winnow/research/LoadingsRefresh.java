package dev.winnow.research;

import dev.winnow.construct.FactorGrid;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.store.FactorStore;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsStore.LoadingsConfig;
import dev.winnow.store.LoadingsStore.Stamp;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorePanelSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.NoSuchElementException;
import java.util.Optional;
import java.util.TreeSet;
import java.util.function.DoubleConsumer;

/**
 * Keeps a panel's stored loadings (its loadings config) in step with its data. After an upload commits, and after the
 * panel's live factors were extended or revised, {@link #afterUpload} computes the loadings of every changed date and
 * recomputes every stored date whose window holds a changed date. Stored rows stamped with older factor data versions
 * are re-stamped when the factor returns in their window did not change, and recomputed when they did.
 */
public final class LoadingsRefresh {
    private static final Logger LOG = LoggerFactory.getLogger(LoadingsRefresh.class);
    private static final int SAVE_BATCH = 16;

    private final PanelStore panels;
    private final FactorStore factors;
    private final LoadingsStore loadings;

    public LoadingsRefresh(PanelStore panels, FactorStore factors, LoadingsStore loadings) {
        this.panels = panels;
        this.factors = factors;
        this.loadings = loadings;
    }

    /** What the config resolves to now: the fingerprint of current factor data, the panel and the aligned factors. */
    private record Inputs(LoadingsSpec spec, String fingerprint, StorePanelSource panel, FactorGrid factors) {
    }

    /**
     * The upload job's hook, called after the upload committed and the panel's live factors were rebuilt.
     * Never throws: a panel without a config, a configured factor that is not ready or an unexpected failure is
     * reported (and logged), and the panel is left without stale stored rows.
     *
     * @param changedDates the dates the upload added or replaced
     * @param revision     whether the upload revised existing dates (reported; the rule is the same either way)
     * @return what the job reports: refreshed (with the counts), skipped or failed (with the reason)
     */
    public LoadingsUpdate afterUpload(long panelId, List<LocalDate> changedDates, boolean revision) {
        Optional<LoadingsConfig> config = loadings.config(panelId);
        if (config.isEmpty()) {
            return LoadingsUpdate.notRefreshed(revision, LoadingsUpdate.Outcome.SKIPPED, "the panel has no loadings config");
        }
        try {
            Inputs in = resolve(panelId, config.get().spec());
            Plan plan = plan(panelId, in, changedDates);
            loadings.delete(panelId, plan.recomputeDates(in));
            loadings.delete(panelId, plan.orphans());
            loadings.restamp(panelId, plan.restamp(), in.fingerprint());
            int computed = computeAndStore(panelId, in, plan.recompute(), p -> { });
            boolean any = !plan.recompute().isEmpty();
            return LoadingsUpdate.refreshed(revision, computed, plan.restamp().size(),
                    any ? in.factors().dates().get(plan.recompute().first()) : null,
                    any ? in.factors().dates().get(plan.recompute().last()) : null);
        } catch (NoSuchElementException | IllegalStateException e) {
            return LoadingsUpdate.notRefreshed(revision, LoadingsUpdate.Outcome.SKIPPED, e.getMessage());
        } catch (RuntimeException e) {
            LOG.error("loadings refresh of panel {} failed", panelId, e);
            return LoadingsUpdate.notRefreshed(revision, LoadingsUpdate.Outcome.FAILED, String.valueOf(e.getMessage()));
        }
    }

    /**
     * Computes and stores the loadings of every date of the panel with its config, replacing what was stored.
     *
     * @throws IllegalStateException when the panel has no config or a configured factor is not ready
     */
    public LoadingsHistory computeHistory(long panelId, DoubleConsumer progress) {
        LoadingsConfig config = loadings.config(panelId).orElseThrow(() ->
                new IllegalStateException("panel " + panelId + " has no loadings config; PUT one first"));
        Inputs in;
        try {
            in = resolve(panelId, config.spec());
        } catch (NoSuchElementException e) {
            throw new IllegalStateException(e.getMessage(), e);
        }
        int dates = in.panel().dates().size();
        TreeSet<Integer> all = new TreeSet<>();
        for (int t = 0; t < dates; t++) {
            all.add(t);
        }
        List<LocalDate> orphans = new ArrayList<>();
        for (Stamp s : loadings.stamps(panelId)) {
            if (Collections.binarySearch(in.panel().dates(), s.asOf()) < 0) {
                orphans.add(s.asOf());
            }
        }
        loadings.delete(panelId, orphans);
        int computed = computeAndStore(panelId, in, all, progress);
        return new LoadingsHistory(panelId, computed, config.spec().factors(), config.spec().window(), config.spec().minObs(),
                dates > 0 ? in.panel().dates().get(0) : null, dates > 0 ? in.panel().dates().get(dates - 1) : null);
    }

    private Inputs resolve(long panelId, LoadingsSpec spec) {
        var versions = LoadingsFactors.currentVersions(factors, spec.factors());
        StorePanelSource panel = panels.source(panelId);
        FactorGrid grid = FactorGrid.align(LoadingsFactors.series(factors, versions), panel.dates());
        return new Inputs(spec, LoadingsStore.fingerprint(spec, versions), panel, grid);
    }

    /**
     * Which grid indices to recompute, which stored dates only need the current fingerprint, and which stored dates
     * left the grid.
     */
    private record Plan(TreeSet<Integer> recompute, List<LocalDate> restamp, List<LocalDate> orphans) {
        List<LocalDate> recomputeDates(Inputs in) {
            return recompute.stream().map(in.factors().dates()::get).toList();
        }
    }

    private Plan plan(long panelId, Inputs in, List<LocalDate> changedDates) {
        List<LocalDate> grid = in.panel().dates();
        int window = in.spec().window();
        Map<LocalDate, Stamp> stored = new LinkedHashMap<>();
        loadings.stamps(panelId).forEach(s -> stored.put(s.asOf(), s));
        TreeSet<Integer> recompute = new TreeSet<>();
        for (LocalDate changed : changedDates) {
            int c = Collections.binarySearch(grid, changed);
            if (c < 0) {
                continue;
            }
            recompute.add(c);
            for (int e = c + 1; e < Math.min(c + window, grid.size()); e++) {
                if (stored.containsKey(grid.get(e))) {
                    recompute.add(e);
                }
            }
        }
        List<LocalDate> restamp = new ArrayList<>();
        List<LocalDate> orphans = new ArrayList<>();
        for (Stamp s : stored.values()) {
            int e = Collections.binarySearch(grid, s.asOf());
            if (e < 0) {
                orphans.add(s.asOf());
            } else if (!recompute.contains(e) && !s.fingerprint().equals(in.fingerprint())) {
                if (in.factors().digest(e, window) == s.factorDigest()) {
                    restamp.add(s.asOf());
                } else {
                    recompute.add(e);
                }
            }
        }
        return new Plan(recompute, restamp, orphans);
    }

    /** Computes the given grid indices run by run (a sliding window per contiguous run) and stores them in batches. */
    private int computeAndStore(long panelId, Inputs in, TreeSet<Integer> indices, DoubleConsumer progress) {
        int total = indices.size();
        int[] done = {0};
        List<LoadingsTable> batch = new ArrayList<>();
        Integer runStart = null;
        Integer previous = null;
        List<int[]> runs = new ArrayList<>();
        for (int t : indices) {
            if (previous == null || t != previous + 1) {
                if (runStart != null) {
                    runs.add(new int[] {runStart, previous});
                }
                runStart = t;
            }
            previous = t;
        }
        if (runStart != null) {
            runs.add(new int[] {runStart, previous});
        }
        for (int[] run : runs) {
            SecurityLoadings.slide(in.panel(), in.factors(), run[0], run[1], in.spec().window(), in.spec().minObs(), table -> {
                batch.add(table);
                if (batch.size() == SAVE_BATCH) {
                    loadings.save(panelId, batch, in.fingerprint());
                    batch.clear();
                }
                done[0]++;
                progress.accept(total == 0 ? 1.0 : (double) done[0] / total);
            });
        }
        loadings.save(panelId, batch, in.fingerprint());
        return done[0];
    }
}
