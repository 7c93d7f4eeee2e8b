package dev.winnow.jobs;

import dev.winnow.research.FactorBuilds;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Job kind {@code family_build}: builds a variant family's new versions from scratch in one pass over each panel
 * (each cross-section read once, each distinct signal recipe evaluated once for every variant that uses it), with
 * progress. A variant that cannot be built is marked failed; the others are still built. The job fails only when
 * every variant failed.
 */
public final class FamilyBuildJob implements JobHandler {
    private final FactorStore factors;
    private final FactorBuilds builds;

    public FamilyBuildJob(FactorStore factors, FactorBuilds builds) {
        this.factors = factors;
        this.builds = builds;
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) {
        JobParams.FamilyBuild params = JobParams.of(job, JobParams.FamilyBuild.class);
        String family = params.family();
        List<FactorVersionRecord> versions = new ArrayList<>();
        List<JobOutcome.JobError> errors = new ArrayList<>();
        for (JobParams.FamilyBuild.Member w : params.versions()) {
            String name = w.factor();
            int version = w.version();
            factors.version(name, version).ifPresentOrElse(versions::add,
                    () -> errors.add(new JobOutcome.JobError(null, null, "factor " + name + " v" + version + " no longer exists")));
        }
        List<JobReports.FactorUpdate> built = new ArrayList<>();
        for (FactorBuilds.TogetherOutcome o : builds.rebuildTogether(versions, progress::report)) {
            FactorVersionRecord v = o.version();
            if (o.error() != null) {
                String message = "factor " + v.name() + " v" + v.version() + " could not be built: " + o.error();
                factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", message)));
                errors.add(new JobOutcome.JobError(null, null, message));
                built.add(JobReports.FactorUpdate.failed(v, o.error()));
            } else {
                built.add(JobReports.FactorUpdate.done(v, JobReports.Action.BUILT, o.report()));
            }
        }
        if (!errors.isEmpty() && built.stream().noneMatch(e -> e.action() == JobReports.Action.BUILT)) {
            return JobOutcome.failure(Counters.ZERO, errors);
        }
        return JobOutcome.success(new Counters(1, 0, 0, 0), new JobReports.FamilyBuild(family, built));
    }
}
