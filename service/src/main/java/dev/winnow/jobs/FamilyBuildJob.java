package dev.winnow.jobs;

import dev.winnow.research.FactorBuilds;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;

import java.util.ArrayList;
import java.util.LinkedHashMap;
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
        List<Map<String, Object>> errors = new ArrayList<>();
        for (JobParams.FamilyBuild.Member w : params.versions()) {
            String name = w.factor();
            int version = w.version();
            factors.version(name, version).ifPresentOrElse(versions::add,
                    () -> errors.add(JobOutcome.error(null, null, "factor " + name + " v" + version + " no longer exists")));
        }
        List<Map<String, Object>> built = new ArrayList<>();
        for (FactorBuilds.TogetherOutcome o : builds.rebuildTogether(versions, progress::report)) {
            FactorVersionRecord v = o.version();
            Map<String, Object> entry = new LinkedHashMap<>();
            entry.put("factor", v.name());
            entry.put("version", v.version());
            if (o.error() != null) {
                String message = "factor " + v.name() + " v" + v.version() + " could not be built: " + o.error();
                factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", message)));
                errors.add(JobOutcome.error(null, null, message));
                entry.put("action", "failed");
            } else {
                entry.putAll(o.report());
                entry.put("action", "built");
            }
            built.add(entry);
        }
        Map<String, Object> report = new LinkedHashMap<>();
        report.put("family", family);
        report.put("variants", built);
        if (!errors.isEmpty() && built.stream().noneMatch(e -> "built".equals(e.get("action")))) {
            return JobOutcome.failure(Counters.ZERO, errors);
        }
        return JobOutcome.success(new Counters(1, 0, 0, 0), report);
    }
}
