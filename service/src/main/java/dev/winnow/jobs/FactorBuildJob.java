package dev.winnow.jobs;

import dev.winnow.research.FactorBuilds;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Job kind {@code factor_build}: builds one factor version from scratch. */
public final class FactorBuildJob implements JobHandler {
    private final FactorStore factors;
    private final FactorBuilds builds;

    public FactorBuildJob(FactorStore factors, FactorBuilds builds) {
        this.factors = factors;
        this.builds = builds;
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) {
        Map<String, Object> params = JsonText.readMap(job.params());
        String name = (String) params.get("factor");
        int version = ((Number) params.get("version")).intValue();
        FactorVersionRecord v = factors.version(name, version).orElse(null);
        if (v == null) {
            return JobOutcome.failure(Counters.ZERO, List.of(JobOutcome.error(null, null, "factor " + name + " v" + version + " no longer exists")));
        }
        try {
            Map<String, Object> report = new LinkedHashMap<>();
            report.put("factor", name);
            report.put("version", version);
            report.putAll(builds.rebuild(v));
            return JobOutcome.success(new Counters(1, 0, 0, 0), report);
        } catch (FactorBuilds.FactorBuildException | IllegalArgumentException e) {
            String message = "factor " + name + " v" + version + " could not be built: " + e.getMessage();
            factors.markFailed(v.factorId(), v.version(), JsonText.write(Map.of("error", message)));
            return JobOutcome.failure(Counters.ZERO, List.of(JobOutcome.error(null, null, message)));
        }
    }
}
