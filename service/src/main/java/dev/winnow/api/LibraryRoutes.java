package dev.winnow.api;

import dev.winnow.research.FactorLibrary;
import dev.winnow.research.PortfolioRiskStudy;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.SeriesAlignment;
import dev.winnow.store.FactorStore.Leg;
import dev.winnow.store.PanelStore;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.List;

/**
 * The risk system's reads over HTTP: the whole library aligned on dates in one answer, the factor covariance,
 * portfolio risk. The work is {@link FactorLibrary}'s and {@link PortfolioRiskStudy}'s; the two GETs are served
 * through {@link ServedResponses}, keyed by the data versions the names resolved to.
 */
final class LibraryRoutes {
    private final FactorLibrary library;
    private final PortfolioRiskStudy risk;
    private final ServedResponses served;
    private final PanelStore panels;

    LibraryRoutes(FactorLibrary library, PortfolioRiskStudy risk, PanelStore panels, ServedResponses served) {
        this.library = library;
        this.risk = risk;
        this.panels = panels;
        this.served = served;
    }

    /** {@code GET /v1/returns}: every named series converted to one frequency, then aligned on dates. */
    void returns(Context ctx) {
        FactorLibrary.Selection selection = library.select(Requests.listParam(ctx, "factors"), "factors", true, 1);
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        boolean cumulative = Requests.choiceParam(ctx, "form", List.of("period", "cumulative"), "period").equals("cumulative");
        Leg leg = Requests.booleanParam(ctx, "net") ? Leg.NET : Leg.SPREAD;
        SeriesAlignment.Join join = Requests.choiceParam(ctx, "join", List.of("outer", "inner"), "outer").equals("inner")
                ? SeriesAlignment.Join.INNER : SeriesAlignment.Join.OUTER;
        boolean csv = Responses.wantsCsv(ctx);
        served.respond(ctx, Responses.dataKey(selection.versions()), csv, () -> {
            FactorLibrary.AlignedReturns aligned = library.returns(selection, leg, from, to, target, cumulative, join);
            return csv ? Responses.csvBody(alignedCsv(selection.names(), aligned.aligned()))
                    : Responses.jsonBody(LibraryWire.Returns.of(aligned));
        });
    }

    private static String alignedCsv(List<String> names, SeriesAlignment.Aligned aligned) {
        StringBuilder sb = new StringBuilder(aligned.size() * (12 + 22 * names.size()) + 64);
        sb.append("date");
        for (String name : names) {
            sb.append(',').append(Responses.csvText(name));
        }
        sb.append('\n');
        for (int t = 0; t < aligned.size(); t++) {
            sb.append(aligned.dates()[t]);
            for (double[] column : aligned.values()) {
                sb.append(',');
                if (Double.isFinite(column[t])) {
                    sb.append(column[t]);
                }
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    /** {@code GET /v1/covariance}: the weighted, optionally Newey-West adjusted covariance of the named series. */
    void covariance(Context ctx) {
        FactorLibrary.Selection selection = library.select(Requests.listParam(ctx, "factors"), "factors", false, 1);
        var settings = CovarianceForms.ofQuery(ctx);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        String annualizeText = ctx.queryParam("annualize");
        boolean annualize = annualizeText == null || annualizeText.isBlank() || Requests.booleanParam(ctx, "annualize");
        boolean csv = Responses.wantsCsv(ctx);
        served.respond(ctx, Responses.dataKey(selection.versions()), csv, () -> {
            FactorLibrary.Covariance c = library.covariance(selection, settings, target, annualize);
            return csv ? Responses.csvBody(matrixCsv(c.names(), c.estimate().covariance())) : Responses.jsonBody(LibraryWire.Covariance.of(c));
        });
    }

    private static String matrixCsv(List<String> names, double[][] matrix) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.join(",", names.stream().map(Responses::csvText).toList())).append('\n');
        for (double[] row : matrix) {
            for (int j = 0; j < row.length; j++) {
                sb.append(j == 0 ? "" : ",").append(Responses.csvNumber(row[j]));
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    /** {@code POST /v1/risk}: the decomposition of {@link PortfolioRiskStudy#risk}. */
    void risk(Context ctx) {
        PortfolioRiskStudy.Query query = RiskRequest.of(ctx, panels);
        PortfolioRiskStudy.Report report = risk.risk(query, source -> ctx.header(LoadingsRoutes.SOURCE_HEADER, source));
        Json.respond(ctx, LibraryWire.Risk.of(report));
    }
}
