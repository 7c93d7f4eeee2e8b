package dev.winnow.jobs;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.research.BuildReport;
import dev.winnow.research.FactorBuilds;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;

import java.util.List;
import java.util.Map;

/**
 * Job kind {@code factor_build}: builds one factor version from scratch, then rebuilds the live, ready factors that
 * read it (as their risk_free rate or in their signal recipe), since their series depend on its returns.
 */
public final class FactorBuildJob implements JobHandler {
    private final FactorStore factors;
    private final FactorBuilds builds;

    public FactorBuildJob(FactorStore factors, FactorBuilds builds) {
        this.factors = factors;
        this.builds = builds;
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) {
        JobParams.FactorBuild params = JobParams.of(job, JobParams.FactorBuild.class);
        String name = params.factor();
        int version = params.version();
        FactorVersionRecord v = factors.version(name, version).orElse(null);
        if (v == null) {
            return JobOutcome.failure(Counters.ZERO, "factor " + name + " v" + version + " no longer exists");
        }
        try {
            BuildReport built = builds.rebuild(v);
            return JobOutcome.success(new Counters(1, 0, 0, 0), new JobReports.FactorBuild(name, version, built, rebuildDependents(name)));
        } catch (FactorBuilds.FactorBuildException | IllegalArgumentException e) {
            String message = "factor " + name + " v" + version + " could not be built: " + e.getMessage();
            factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", message)));
            return JobOutcome.failure(Counters.ZERO, message);
        }
    }

    private List<JobReports.FactorUpdate> rebuildDependents(String name) {
        List<JobReports.FactorUpdate> rebuilt = new java.util.ArrayList<>();
        List<FactorVersionRecord> live = FactorBuilds.dependenciesFirst(factors.listCurrent(false));
        java.util.Set<String> changed = new java.util.HashSet<>(List.of(name));
        for (FactorVersionRecord dependent : live) {
            if (dependent.method() == FactorDefinition.Method.EXTERNAL || dependent.status() != VersionStatus.READY) {
                continue;
            }
            FactorDefinition def = FactorBuilds.definition(dependent);
            if (changed.stream().noneMatch(c -> FactorBuilds.dependsOn(def, c))) {
                continue;
            }
            try {
                rebuilt.add(JobReports.FactorUpdate.done(dependent, JobReports.Action.REBUILT, builds.rebuild(dependent)));
                changed.add(dependent.name());
            } catch (FactorBuilds.FactorBuildException | IllegalArgumentException e) {
                rebuilt.add(JobReports.FactorUpdate.failed(dependent, e.getMessage()));
            }
        }
        return rebuilt;
    }
}
