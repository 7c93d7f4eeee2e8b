package dev.winnow.jobs;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.ingest.ExternalSeriesParser;
import dev.winnow.ingest.SeriesParseResult;
import dev.winnow.ingest.UploadMode;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.research.FactorBuilds;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.StoredReturn;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * Job kind {@code series_upload}: an external series (bond, term, credit, macro, risk-free) uploaded as
 * {@code date,return}; all or nothing. Factors that subtract it as their risk-free rate (or whose signal recipe
 * reads it) are rebuilt from their last
 * checkpoint before the upload's first date, after an append as well as a revision: an appended risk-free date can
 * fill market returns that were missing on panel dates already built.
 */
public final class SeriesUploadJob implements JobHandler {
    private final FactorStore factors;
    private final FactorBuilds builds;
    private final UploadSpool spool;
    private final ExternalSeriesParser parser = new ExternalSeriesParser();

    public SeriesUploadJob(FactorStore factors, FactorBuilds builds, UploadSpool spool) {
        this.factors = factors;
        this.builds = builds;
        this.spool = spool;
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception {
        JobParams.SeriesUpload params = JobParams.of(job, JobParams.SeriesUpload.class);
        String name = params.factor();
        int version = params.version();
        boolean revise = params.revise();
        UploadMode mode = revise ? UploadMode.REVISE : UploadMode.APPEND;
        String file = params.file();
        FactorVersionRecord v = factors.version(name, version).orElse(null);
        if (v == null) {
            return JobOutcome.failure(Counters.ZERO, "factor " + name + " v" + version + " no longer exists");
        }
        ReturnSeries stored = factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD);
        LocalDate lastDate = revise || stored.size() == 0 ? null : stored.date(stored.size() - 1);
        SeriesParseResult result = parser.parse(spool.resolve(file), params.gzip(),
                mode, lastDate);
        Counters counters = new Counters(0.5, result.rowsRead(), result.rowsAccepted(), result.rowsRejected());
        if (!result.accepted()) {
            spool.delete(file);
            return JobOutcome.failure(counters, PanelUploadJob.errors(result.errors(), result.errorCount()));
        }
        // a job queued again after a crash may find its rows already stored: store only what is not there yet
        ReturnSeries series = result.series();
        List<StoredReturn> rows = new ArrayList<>(series.size());
        for (int i = 0; i < series.size(); i++) {
            if (revise || lastDate == null || series.date(i).isAfter(lastDate)) {
                rows.add(new StoredReturn(series.date(i), series.value(i), Double.NaN, Double.NaN, Double.NaN));
            }
        }
        factors.saveExternal(v.factorId(), v.version(), rows, revise);
        progress.report(counters);

        JobReports.SeriesUpload report = new JobReports.SeriesUpload(name, version, mode,
                rows.size(), rebuildDependents(name, series.size() == 0 ? null : series.date(0)));
        spool.delete(file);
        return JobOutcome.success(new Counters(1, counters.rowsRead(), counters.rowsAccepted(), counters.rowsRejected()), report);
    }

    /** Whatever the end, the spooled body is removed. */
    @Override
    public void afterEnd(JobRecord job) {
        spool.delete(JobParams.of(job, JobParams.SeriesUpload.class).file());
    }

    private List<JobReports.FactorUpdate> rebuildDependents(String riskFreeName, LocalDate earliestChanged) {
        List<JobReports.FactorUpdate> rebuilt = new ArrayList<>();
        for (FactorVersionRecord dependent : factors.listCurrent(false)) {
            if (dependent.method() == FactorDefinition.Method.EXTERNAL || dependent.status() != VersionStatus.READY) {
                continue;
            }
            FactorDefinition def = FactorBuilds.definition(dependent);
            if (!FactorBuilds.dependsOn(def, riskFreeName)) {
                continue;
            }
            try {
                rebuilt.add(JobReports.FactorUpdate.done(dependent, JobReports.Action.REBUILT, builds.rebuildFrom(dependent, earliestChanged)));
            } catch (FactorBuilds.FactorBuildException | IllegalArgumentException e) {
                rebuilt.add(JobReports.FactorUpdate.failed(dependent, e.getMessage()));
            }
        }
        return rebuilt;
    }
}
