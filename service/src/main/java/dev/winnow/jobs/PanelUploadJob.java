package dev.winnow.jobs;

import dev.winnow.construct.CrossSection;
import dev.winnow.ingest.ColumnType;
import dev.winnow.ingest.PanelParseResult;
import dev.winnow.ingest.PanelUpload;
import dev.winnow.ingest.PanelUploadParser;
import dev.winnow.ingest.UploadError;
import dev.winnow.ingest.UploadMode;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.ingest.CrossSectionSink;
import dev.winnow.research.FactorBuilds;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import dev.winnow.store.SecurityDictionary;
import dev.winnow.store.SliceDecimals;
import dev.winnow.store.SliceStager;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Job kind {@code panel_upload}: validates and stages the spooled CSV, commits it in one transaction, then brings
 * every live factor on the panel up to date: appended dates extend each factor from its stored engine state, a
 * revision rebuilds it from its last checkpoint before the earliest revised date. A job queued again after a crash skips the parse when its upload had already committed.
 */
public final class PanelUploadJob implements JobHandler {
    private final PanelStore panels;
    private final FactorStore factors;
    private final FactorBuilds builds;
    private final UploadSpool spool;
    private final PanelUploadParser parser = new PanelUploadParser();
    private final List<PanelChangeListener> listeners;

    /** Told about dates a committed upload added or replaced, after the factors are up to date. */
    @FunctionalInterface
    public interface PanelChangeListener {
        Map<String, Object> afterUpload(long panelId, List<LocalDate> changedDates, boolean revision) throws Exception;
    }

    public PanelUploadJob(PanelStore panels, FactorStore factors, FactorBuilds builds, UploadSpool spool,
                          List<PanelChangeListener> listeners) {
        this.panels = panels;
        this.factors = factors;
        this.builds = builds;
        this.spool = spool;
        this.listeners = List.copyOf(listeners);
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception {
        JobParams.PanelUpload params = JobParams.of(job, JobParams.PanelUpload.class);
        String panelName = params.panel();
        boolean revise = params.revise();
        String file = params.file();
        long panelId = panels.createPanelIfAbsent(panelName);

        Map<String, Object> timings = new LinkedHashMap<>();
        Optional<List<LocalDate>> already = panels.committedUploadDates(job.id());
        panels.discardStagingOfJob(job.id());
        Counters counters;
        List<LocalDate> dates;
        if (already.isPresent()) {
            dates = already.get();
            counters = new Counters(0.9, 0, 0, 0);
        } else {
            PanelRecord panel = panels.find(panelId).orElseThrow();
            Map<String, String> stored = panels.columns(panelId);
            Map<String, ColumnType> existing = new LinkedHashMap<>();
            stored.forEach((name, type) -> {
                if (!PanelUpload.isFixedColumn(name)) {
                    existing.put(name, type.equals("number") ? ColumnType.NUMBER : ColumnType.LABEL);
                }
            });
            LocalDate lastDate = panel.visible() && !revise ? panel.lastDate() : null;
            PanelUpload upload = new PanelUpload(spool.resolve(file), params.gzip(),
                    revise ? UploadMode.REVISE : UploadMode.APPEND, lastDate, existing);
            long uploadId = panels.beginUpload(panelId, job.id(), revise ? "revise" : "append");
            PanelParseResult result;
            long parseStart = System.nanoTime();
            try (SliceStager stager = panels.stager(panelId, uploadId)) {
                SecurityDictionary ids = panels.batchedSecurityDictionary(panelId, uploadId);
                result = parser.parse(upload, ids::idFor, sinkInto(stager),
                        p -> progress.report(new Counters(0.9 * p.fraction(), p.rowsRead(), p.rowsAccepted(), p.rowsRejected())));
                if (result.accepted()) {
                    long parsed = System.nanoTime();
                    ids.flush();
                    SliceStager.Stats staged = stager.finish();
                    timings.put("parse", millis(parsed - parseStart));
                    timings.put("staging_after_parse", millis(System.nanoTime() - parsed));
                    timings.put("encode", millis(staged.encodeNanos()));
                    timings.put("stage_writes", millis(staged.writeNanos()));
                }
            } catch (Exception | Error e) {
                panels.discardUpload(uploadId);
                throw e;
            }
            counters = new Counters(0.9, result.rowsRead(), result.rowsAccepted(), result.rowsRejected());
            if (!result.accepted()) {
                panels.discardUpload(uploadId);
                spool.delete(file);
                return JobOutcome.failure(counters, errors(result.errors(), result.errorCount()));
            }
            Map<String, String> newColumns = new LinkedHashMap<>();
            result.newColumns().forEach((name, type) -> newColumns.put(name, type == ColumnType.NUMBER ? "number" : "label"));
            if (result.stats().columns().containsKey(PanelUpload.MARKET_CAP) && !stored.containsKey(PanelUpload.MARKET_CAP)) {
                newColumns.put(PanelUpload.MARKET_CAP, "number");
            }
            long commitStart = System.nanoTime();
            panels.commitUpload(panelId, uploadId, newColumns);
            timings.put("commit", millis(System.nanoTime() - commitStart));
            dates = result.dates();
        }
        progress.report(counters);

        Map<String, Object> report = new LinkedHashMap<>();
        report.put("panel", panelName);
        report.put("mode", revise ? "revise" : "append");
        report.put("dates", dates.size());
        report.put("first_date", dates.isEmpty() ? null : dates.get(0));
        report.put("last_date", dates.isEmpty() ? null : dates.get(dates.size() - 1));
        long factorsStart = System.nanoTime();
        report.put("factors", updateFactors(panelId, revise ? earliest(dates) : null, revise));
        timings.put("factors", millis(System.nanoTime() - factorsStart));
        for (PanelChangeListener listener : listeners) {
            report.putAll(listener.afterUpload(panelId, dates, revise));
        }
        report.put("timings_ms", timings);
        spool.delete(file);
        return JobOutcome.success(new Counters(1, counters.rowsRead(), counters.rowsAccepted(), counters.rowsRejected()), report);
    }

    /** The parser's sink staging into {@code stager}, which forgets what it staged when the parser starts over. */
    public static CrossSectionSink sinkInto(SliceStager stager) {
        return new CrossSectionSink() {
            @Override
            public void accept(CrossSection cs) throws InterruptedException {
                stager.accept(cs);
            }

            @Override
            public void accept(CrossSection cs, SliceDecimals decimals) throws InterruptedException {
                stager.accept(cs, decimals);
            }

            @Override
            public void discardAccepted() {
                stager.discardStaged();
            }
        };
    }

    private static long millis(long nanos) {
        return nanos / 1_000_000;
    }

    /** Whatever the end: staged rows that did not commit are discarded and the spooled body removed. */
    @Override
    public void afterEnd(JobRecord job) {
        panels.discardStagingOfJob(job.id());
        spool.delete(JobParams.of(job, JobParams.PanelUpload.class).file());
    }

    /** The earliest of the dates, or null (then a revision rebuilds from scratch). */
    private static LocalDate earliest(List<LocalDate> dates) {
        return dates.stream().min(LocalDate::compareTo).orElse(null);
    }

    private List<Map<String, Object>> updateFactors(long panelId, LocalDate earliestRevised, boolean revise) {
        List<FactorVersionRecord> live = FactorBuilds.dependenciesFirst(factors.liveOnPanel(panelId));
        List<FactorBuilds.TogetherOutcome> outcomes = new ArrayList<>();
        if (revise) {
            // full rebuilds share one pass over the panel; the others resume from their checkpoints
            outcomes.addAll(builds.rebuildAllFrom(live, earliestRevised));
        } else {
            for (FactorVersionRecord v : live) {
                try {
                    outcomes.add(new FactorBuilds.TogetherOutcome(v, builds.extend(v), null));
                } catch (FactorBuilds.FactorBuildException | IllegalArgumentException e) {
                    outcomes.add(new FactorBuilds.TogetherOutcome(v, null, e.getMessage()));
                }
            }
        }
        List<Map<String, Object>> updated = new ArrayList<>();
        for (FactorBuilds.TogetherOutcome o : outcomes) {
            FactorVersionRecord v = o.version();
            Map<String, Object> entry = new LinkedHashMap<>();
            entry.put("factor", v.name());
            entry.put("version", v.version());
            entry.put("action", revise ? "rebuilt" : "extended");
            if (o.error() == null) {
                entry.putAll(o.report());
            } else {
                factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", o.error())));
                entry.put("action", "failed");
                entry.put("error", o.error());
            }
            updated.add(entry);
        }
        return updated;
    }

    /** Upload errors as job errors, with a closing line when more were found than listed. */
    static List<Map<String, Object>> errors(List<UploadError> listed, long total) {
        List<Map<String, Object>> out = new ArrayList<>();
        for (UploadError e : listed) {
            out.add(JobOutcome.error(e.line(), e.column(), e.message()));
        }
        if (total > listed.size()) {
            out.add(JobOutcome.error(null, null, (total - listed.size())
                    + " more error(s) not listed; fix the ones above and upload again"));
        }
        return out;
    }


}
