package dev.winnow.api;

import dev.winnow.api.TrialLibrary.Snapshot;
import dev.winnow.api.TrialLibrary.Trial;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;
import io.javalin.http.Context;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** The evidence against data mining: the library-wide trial table, one factor's evidence, and themes. */
final class EvidenceRoutes {
    private final FactorStore factors;
    private final TrialLibrary library;
    private final FactorEvidence evidence;
    private final Breadth breadth;
    private final Themes themes;

    EvidenceRoutes(FactorStore factors, PanelStore panels) {
        this.factors = factors;
        this.library = new TrialLibrary(factors);
        this.breadth = new Breadth(panels, factors);
        this.evidence = new FactorEvidence(factors, breadth);
        this.themes = new Themes(factors);
    }

    /** {@code risk_free=include} (default: every version is a trial) or {@code exclude} (risk-free rates are not). */
    private static boolean leaveOutRiskFree(Context ctx) {
        return Requests.choiceParam(ctx, "risk_free", List.of("include", "exclude"), "include").equals("exclude");
    }

    void table(Context ctx) {
        Snapshot snapshot = library.snapshot(leaveOutRiskFree(ctx));
        List<Map<String, Object>> rows = new ArrayList<>();
        List<Map<String, Object>> excluded = new ArrayList<>();
        for (Trial trial : snapshot.trials()) {
            if (trial.inTable()) {
                rows.add(EvidenceJson.row(trial, trial.row()));
            } else {
                excluded.add(EvidenceJson.excluded(trial));
            }
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("trials", snapshot.table().trials());
        out.put("basis", "monthly");
        out.put("sharpe_variance", snapshot.table().sharpeVariance());
        out.put("expected_max_sharpe", snapshot.table().expectedMaxSharpe());
        out.put("factors", rows);
        out.put("excluded", excluded);
        Json.respond(ctx, out);
    }

    void factor(Context ctx) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        String segment = ctx.queryParam("segment");
        segment = segment == null || segment.isBlank() ? null : segment.trim();
        List<String> against = Requests.listParam(ctx, "against");
        Snapshot snapshot = library.snapshot(leaveOutRiskFree(ctx));
        // versions are never deleted, so the snapshot taken after the lookup holds this one
        Trial trial = snapshot.find(v).orElseThrow();
        List<Trial> regressors = FactorEvidence.against(trial, snapshot, against);
        breadth.checkSegment(trial, segment);
        Json.respond(ctx, evidence.report(trial, snapshot, segment, regressors));
    }

    void themes(Context ctx) {
        Double threshold = Requests.doubleParam(ctx, "threshold");
        double cut = threshold == null ? 0.5 : threshold;
        if (cut < -1.0 || cut > 1.0) {
            throw ApiProblem.badRequest("Query parameter 'threshold' is a correlation from -1 to 1, got " + cut + ".");
        }
        Json.respond(ctx, themes.comparison(library.snapshot(), cut));
    }

    void themeReturns(Context ctx) {
        themes.returns(ctx, ctx.pathParam("theme"));
    }
}
