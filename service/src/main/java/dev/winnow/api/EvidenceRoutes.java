package dev.winnow.api;

import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.research.Breadth;
import dev.winnow.research.EvidenceJson;
import dev.winnow.research.FactorEvidence;
import dev.winnow.research.Themes;
import dev.winnow.research.TrialLibrary;
import dev.winnow.research.TrialLibrary.Snapshot;
import dev.winnow.research.TrialLibrary.Trial;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/** The evidence against data mining: the library-wide trial table, one factor's evidence, and themes. */
final class EvidenceRoutes {
    private final FactorStore factors;
    private final TrialLibrary library;
    private final FactorEvidence evidence;
    private final Breadth breadth;
    private final Themes themes;

    EvidenceRoutes(FactorStore factors, TrialLibrary library, FactorEvidence evidence, Breadth breadth, Themes themes) {
        this.factors = factors;
        this.library = library;
        this.breadth = breadth;
        this.evidence = evidence;
        this.themes = themes;
    }

    /**
     * {@code risk_free=exclude} is kept for one release as an alias of what every answer now does: inputs (risk-free
     * rates among them) are never trials. {@code include}, which counted risk-free rates as trials, is gone.
     */
    private static void checkRiskFreeAlias(Context ctx) {
        String value = Requests.choiceParam(ctx, "risk_free", List.of("include", "exclude"), "exclude");
        if (value.equals("include")) {
            throw ApiProblem.badRequest("Query parameter 'risk_free=include' is gone: inputs (a factor declared with \"role\": \"input\","
                    + " or one without a role that a live definition names as its risk_free) are never trials. To count a series as a trial,"
                    + " declare it with \"role\": \"factor\"; 'risk_free=exclude' still works and changes nothing.");
        }
    }

    void table(Context ctx) {
        checkRiskFreeAlias(ctx);
        Snapshot snapshot = library.snapshot();
        List<EvidenceJson.Row> rows = new ArrayList<>();
        List<EvidenceJson.Excluded> excluded = new ArrayList<>();
        for (Trial trial : snapshot.trials()) {
            if (trial.inTable()) {
                rows.add(EvidenceJson.row(trial, trial.row()));
            } else {
                excluded.add(EvidenceJson.excluded(trial));
            }
        }
        Json.respond(ctx, new Table(snapshot.table().trials(), "monthly", snapshot.table().sharpeVariance(),
                snapshot.table().expectedMaxSharpe(), rows, excluded));
    }

    /** The trial table: N, its basis, V and SR0, a row per trial and the versions that are no trial. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record Table(int trials, String basis, double sharpeVariance, double expectedMaxSharpe, List<EvidenceJson.Row> factors,
                 List<EvidenceJson.Excluded> excluded) {
    }

    /** A theme's composite series. */
    record ThemeReturns(String theme, List<String> factors, String frequency, String form, LocalDate[] dates, double[] returns) {
    }

    void factor(Context ctx) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        String segment = ctx.queryParam("segment");
        segment = segment == null || segment.isBlank() ? null : segment.trim();
        List<String> against = Requests.listParam(ctx, "against");
        checkRiskFreeAlias(ctx);
        Snapshot snapshot = library.snapshot();
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

    /**
     * The theme's composite series (see {@link Themes#composite}): from/to, frequency and form as for a factor's
     * returns; JSON or CSV; an ETag over every member's data version.
     */
    void themeReturns(Context ctx) {
        String theme = ctx.pathParam("theme");
        List<FactorVersionRecord> members = themes.members(theme);
        SeriesRequest.Window window = SeriesRequest.Window.of(ctx);
        boolean csv = Responses.wantsCsv(ctx);
        StringBuilder key = new StringBuilder("theme:").append(theme);
        members.forEach(v -> key.append(';').append(v.factorId()).append('.').append(v.version()).append('.').append(v.dataVersion()));
        if (Responses.notModified(ctx, key.toString(), csv)) {
            return;
        }
        Themes.Composite composite = themes.composite(theme, members, window.from(), window.to(), window.target(), window.cumulative());
        ReturnSeries series = composite.series();
        if (csv) {
            Responses.csv(ctx, "date,return", series.dates(), series.values());
            return;
        }
        Json.respond(ctx, new ThemeReturns(theme, composite.factors(), composite.frequency().wireName(), window.form(), series.dates(),
                series.values()));
    }
}
