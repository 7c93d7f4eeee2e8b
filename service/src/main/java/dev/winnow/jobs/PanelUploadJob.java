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
import dev.winnow.research.LoadingsUpdate;
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
    private final PanelChangeListener loadings;

    /** Told about dates a committed upload added or replaced, after the factors are up to date: the stored loadings. */
    @FunctionalInterface
    public interface PanelChangeListener {
        LoadingsUpdate afterUpload(long panelId, List<LocalDate> changedDates, boolean revision) throws Exception;
    }

    public PanelUploadJob(PanelStore panels, FactorStore factors, FactorBuilds builds, UploadSpool spool,
                          PanelChangeListener loadings) {
        this.panels = panels;
        this.factors = factors;
        this.builds = builds;
        this.spool = spool;
        this.loadings = java.util.Objects.requireNonNull(loadings, "loadings");
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception {
        JobParams.PanelUpload params = JobParams.of(job, JobParams.PanelUpload.class);
        String panelName = params.panel();
        boolean revise = params.revise();
        UploadMode mode = revise ? UploadMode.REVISE : UploadMode.APPEND;
        String file = params.file();
        long panelId = panels.createPanelIfAbsent(panelName);

        Long parseMillis = null;
        Long stagingMillis = null;
        Long encodeMillis = null;
        Long writeMillis = null;
        Long commitMillis = null;
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
                    mode, lastDate, existing);
            long uploadId = panels.beginUpload(panelId, job.id(), mode.wireName());
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
                    parseMillis = millis(parsed - parseStart);
                    stagingMillis = millis(System.nanoTime() - parsed);
                    encodeMillis = millis(staged.encodeNanos());
                    writeMillis = millis(staged.writeNanos());
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
            commitMillis = millis(System.nanoTime() - commitStart);
            dates = result.dates();
        }
        progress.report(counters);

        long factorsStart = System.nanoTime();
        List<JobReports.FactorUpdate> updated = updateFactors(panelId, revise ? earliest(dates) : null, revise);
        long factorsMillis = millis(System.nanoTime() - factorsStart);
        LoadingsUpdate loadingsUpdate = loadings.afterUpload(panelId, dates, revise);
        JobReports.PanelUpload report = new JobReports.PanelUpload(panelName, mode,
                dates.size(), dates.isEmpty() ? null : dates.get(0), dates.isEmpty() ? null : dates.get(dates.size() - 1),
                updated, loadingsUpdate,
                new JobReports.UploadTimings(parseMillis, stagingMillis, encodeMillis, writeMillis, commitMillis, factorsMillis));
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

    private List<JobReports.FactorUpdate> updateFactors(long panelId, LocalDate earliestRevised, boolean revise) {
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
        List<JobReports.FactorUpdate> updated = new ArrayList<>();
        for (FactorBuilds.TogetherOutcome o : outcomes) {
            FactorVersionRecord v = o.version();
            if (o.error() == null) {
                updated.add(JobReports.FactorUpdate.done(v, revise ? JobReports.Action.REBUILT : JobReports.Action.EXTENDED, o.report()));
            } else {
                factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", o.error())));
                updated.add(JobReports.FactorUpdate.failed(v, o.error()));
            }
        }
        return updated;
    }

    /** Upload errors as job errors, with a closing line when more were found than listed. */
    static List<JobOutcome.JobError> errors(List<UploadError> listed, long total) {
        List<JobOutcome.JobError> out = new ArrayList<>();
        for (UploadError e : listed) {
            out.add(new JobOutcome.JobError(e.line(), e.column(), e.message()));
        }
        if (total > listed.size()) {
            out.add(new JobOutcome.JobError(null, null, (total - listed.size())
                    + " more error(s) not listed; fix the ones above and upload again"));
        }
        return out;
    }


}
