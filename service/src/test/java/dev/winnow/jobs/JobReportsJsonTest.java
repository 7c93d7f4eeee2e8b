package dev.winnow.jobs;

import dev.winnow.ingest.UploadMode;
import dev.winnow.research.BuildReport;
import dev.winnow.research.LoadingsHistory;
import dev.winnow.research.LoadingsUpdate;
import dev.winnow.store.JsonText;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The job reports as the store keeps them and {@code GET /v1/jobs/{id}} serves them: the field names and the
 * presence rules that openapi.yaml's {@code Job.report} describes (a revision's {@code rebuilt_from} written as null
 * for a full rebuild, absent from other builds; a failed factor with its error and no counts; the parse timings
 * absent when a job queued again found its upload committed), written by the store's own JSON writer.
 */
class JobReportsJsonTest {
    private static final BuildReport BUILD = new BuildReport(120, 3, 20, 2, null);

    private static Map<String, Object> json(Object report) {
        return JsonText.readMap(JsonText.write(report));
    }

    private static Map<String, Object> map(Object... keysAndValues) {
        Map<String, Object> m = new LinkedHashMap<>();
        for (int i = 0; i < keysAndValues.length; i += 2) {
            m.put((String) keysAndValues[i], keysAndValues[i + 1]);
        }
        return m;
    }

    @Test
    void aBuildOfAFactorAndItsDependents() {
        JobReports.FactorUpdate rebuilt = new JobReports.FactorUpdate("hml", 2, JobReports.Action.REBUILT, BUILD, null);
        JobReports.FactorUpdate failed = new JobReports.FactorUpdate("umd", 1, JobReports.Action.FAILED, null, "no panel");
        assertEquals(map("factor", "smb", "version", 1, "observations", 120, "periods_without_return", 3, "new_observations", 20,
                        "new_formations", 2, "dependents", List.of(
                                map("factor", "hml", "version", 2, "action", "rebuilt", "observations", 120,
                                        "periods_without_return", 3, "new_observations", 20, "new_formations", 2),
                                map("factor", "umd", "version", 1, "action", "failed", "error", "no panel"))),
                json(new JobReports.FactorBuild("smb", 1, BUILD, List.of(rebuilt, failed))));
    }

    @Test
    void aRevisionSaysWhereEachFactorRestarted() {
        BuildReport full = new BuildReport(120, 3, 120, 12, new BuildReport.Revision(null, 300));
        BuildReport resumed = new BuildReport(120, 3, 20, 2, new BuildReport.Revision(LocalDate.of(2031, 6, 30), 48));
        Map<String, Object> report = json(new JobReports.PanelUpload("harbor", UploadMode.REVISE, 1, LocalDate.of(2031, 1, 2),
                LocalDate.of(2031, 1, 2), List.of(new JobReports.FactorUpdate("a", 1, JobReports.Action.REBUILT, full, null),
                        new JobReports.FactorUpdate("b", 1, JobReports.Action.REBUILT, resumed, null)),
                new LoadingsUpdate(true, LoadingsUpdate.Outcome.SKIPPED, "the panel has no loadings config", null, null, null, null),
                new JobReports.UploadTimings(null, null, null, null, null, 41)));
        assertEquals(map("panel", "harbor", "mode", "revise", "dates", 1, "first_date", "2031-01-02", "last_date", "2031-01-02",
                "factors", List.of(
                        map("factor", "a", "version", 1, "action", "rebuilt", "observations", 120, "periods_without_return", 3,
                                "new_observations", 120, "new_formations", 12, "rebuilt_from", null, "recomputed_dates", 300),
                        map("factor", "b", "version", 1, "action", "rebuilt", "observations", 120, "periods_without_return", 3,
                                "new_observations", 20, "new_formations", 2, "rebuilt_from", "2031-06-30", "recomputed_dates", 48)),
                "loadings", map("revision", true, "loadings", "skipped", "reason", "the panel has no loadings config"),
                "timings_ms", map("factors", 41)), report);
    }

    @Test
    void anAppendWithEveryPhaseAndRefreshedLoadings() {
        Map<String, Object> report = json(new JobReports.PanelUpload("harbor", UploadMode.APPEND, 0, null, null, List.of(),
                new LoadingsUpdate(false, LoadingsUpdate.Outcome.REFRESHED, null, 0, 250, null, null),
                new JobReports.UploadTimings(900L, 12L, 300L, 400L, 15L, 0)));
        assertEquals(map("panel", "harbor", "mode", "append", "dates", 0, "first_date", null, "last_date", null, "factors", List.of(),
                "loadings", map("revision", false, "loadings", "refreshed", "computed_dates", 0, "restamped_dates", 250),
                "timings_ms", map("parse", 900, "staging_after_parse", 12, "encode", 300, "stage_writes", 400, "commit", 15,
                        "factors", 0)), report);
    }

    @Test
    void theOtherKindsAndAnError() {
        assertEquals(map("family", "mom-grid", "variants", List.of(map("factor", "mom_6", "version", 1, "action", "built",
                        "observations", 120, "periods_without_return", 3, "new_observations", 20, "new_formations", 2))),
                json(new JobReports.FamilyBuild("mom-grid", List.of(new JobReports.FactorUpdate("mom_6", 1, JobReports.Action.BUILT, BUILD, null)))));
        assertEquals(map("factor", "rf", "version", 1, "mode", "append", "dates", 5, "factors", List.of()),
                json(new JobReports.SeriesUpload("rf", 1, UploadMode.APPEND, 5, List.of())));
        assertEquals(map("panel_id", 7, "computed_dates", 60, "factors", List.of("mkt", "smb"), "window", 30, "min_obs", 20,
                        "first_date", "2031-01-02", "last_date", "2031-03-31"),
                json(new JobReports.LoadingsHistoryComputed(new LoadingsHistory(7, 60, List.of("mkt", "smb"), 30, 20,
                        LocalDate.of(2031, 1, 2), LocalDate.of(2031, 3, 31)))));
        assertEquals(map("store_bytes_before", 2048, "store_bytes_after", 1024, "note", "compacted"),
                json(new JobReports.StoreCompaction(2048L, 1024L, "compacted")));
        // PostgreSQL reclaims space itself: no sizes (dev.winnow.store.Database#compact)
        assertEquals(map("store_bytes_before", null, "store_bytes_after", null, "note", "nothing to do"),
                json(new JobReports.StoreCompaction(null, null, "nothing to do")));
        assertEquals(List.of(map("line", null, "column", null, "message", "factor x v1 no longer exists"),
                        map("line", 12, "column", "return", "message", "not a number")),
                JsonText.readList(JsonText.write(List.of(new JobOutcome.JobError(null, null, "factor x v1 no longer exists"),
                        new JobOutcome.JobError(12L, "return", "not a number")))));
    }
}
