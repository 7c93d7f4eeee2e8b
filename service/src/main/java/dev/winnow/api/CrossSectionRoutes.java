package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.Recipe;
import dev.winnow.construct.RecipeJson;
import dev.winnow.construct.Universe;
import dev.winnow.research.FactorPortfolios;
import dev.winnow.research.FamaMacBethStudy;
import dev.winnow.research.InformationCoefficients;
import dev.winnow.research.ModelTests;
import dev.winnow.stats.FactorModelTest;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/** Cross-sectional evidence over HTTP: bucket portfolios, Fama-MacBeth regressions, tests of a factor model on test assets. */
final class CrossSectionRoutes {
    static final int MAX_SIGNALS = 20;
    static final int MAX_MODEL_SERIES = 200;
    private static final Set<String> FAMA_MACBETH_FIELDS = Set.of("panel", "signals", "lag", "standardize", "weighting",
            "universe", "from", "to");

    private final FactorStore factors;
    private final FamaMacBethStudy famaMacBeth;
    private final ModelTests modelTests;
    private final FactorPortfolios portfolios;
    private final InformationCoefficients informationCoefficients;
    private final ServedResponses served;

    CrossSectionRoutes(FactorStore factors, FamaMacBethStudy famaMacBeth, ModelTests modelTests, FactorPortfolios portfolios,
                       InformationCoefficients informationCoefficients, ServedResponses served) {
        this.served = served;
        this.factors = factors;
        this.famaMacBeth = famaMacBeth;
        this.modelTests = modelTests;
        this.portfolios = portfolios;
        this.informationCoefficients = informationCoefficients;
    }

    /** {@code GET /v1/factors/{factor}/ic?horizons&method&min_securities&from&to&version}. */
    void informationCoefficients(Context ctx) {
        IcRequest request = IcRequest.of(ctx, factors);
        boolean csv = Responses.wantsCsv(ctx);
        if (Responses.notModified(ctx, request.version(), csv)) {
            return;
        }
        InformationCoefficients.Result r = informationCoefficients.run(request.study());
        if (csv) {
            StringBuilder sb = new StringBuilder("date");
            r.horizons().forEach(h -> sb.append(",ic_").append(h));
            sb.append('\n');
            for (int t = 0; t < r.dates().size(); t++) {
                sb.append(r.dates().get(t));
                for (double[] row : r.ic()) {
                    sb.append(',').append(Responses.csvNumber(row[t]));
                }
                sb.append('\n');
            }
            Responses.csv(ctx, sb.toString());
            return;
        }
        Json.respond(ctx, CrossSectionWire.InformationCoefficients.of(r, request.method()));
    }

    /** {@code GET /v1/factors/{factor}/portfolios?from&to&frequency&form&version}. */
    void portfolios(Context ctx) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        SeriesRequest.Window window = SeriesRequest.Window.of(ctx);
        boolean csv = Responses.wantsCsv(ctx);
        // served from memory like the series: the key is the version's data version, which every build bumps
        served.respond(ctx, Responses.dataKey(v), csv, () -> {
            FactorPortfolios.Table table = portfolios.table(v, window.from(), window.to(), window.target(), window.cumulative());
            if (csv) {
                StringBuilder sb = new StringBuilder("date");
                table.names().forEach(n -> sb.append(',').append(Responses.csvText(n)));
                sb.append('\n');
                for (int t = 0; t < table.dates().size(); t++) {
                    sb.append(table.dates().get(t));
                    for (double[] row : table.returns()) {
                        sb.append(',').append(Responses.csvNumber(row[t]));
                    }
                    sb.append('\n');
                }
                return Responses.csvBody(sb.toString());
            }
            Map<String, double[]> returns = new LinkedHashMap<>();
            for (int k = 0; k < table.names().size(); k++) {
                returns.put(table.names().get(k), table.returns().get(k));
            }
            return Responses.jsonBody(new CrossSectionWire.Portfolios(v.name(), v.version(), table.frequency().wireName(), window.form(),
                    table.names(), table.dates(), returns));
        });
    }

    /** {@code POST /v1/fama-macbeth} (read scope). */
    void famaMacBeth(Context ctx) {
        boolean csv = Responses.wantsCsv(ctx);
        FamaMacBethStudy.Result result = famaMacBeth.run(famaMacBethRequest(Json.readObject(ctx)));
        if (csv) {
            Responses.csv(ctx, CrossSectionWire.famaMacBethCsv(result));
        } else {
            Json.respond(ctx, CrossSectionWire.FamaMacBeth.of(result));
        }
    }

    static FamaMacBethStudy.Request famaMacBethRequest(JsonNode body) {
        Requests.allowOnly(body, FAMA_MACBETH_FIELDS);
        String panel = Requests.requiredText(body, "panel");
        JsonNode signalsNode = body.get("signals");
        if (signalsNode == null || !signalsNode.isObject() || signalsNode.isEmpty()) {
            throw ApiProblem.badRequest("Field 'signals' is required: an object naming 1 to " + MAX_SIGNALS
                    + " signals, each a numeric column or a signal recipe, as {\"value\": \"book_to_price\", \"size\": {\"log\": \"market_cap\"}}.");
        }
        if (signalsNode.size() > MAX_SIGNALS) {
            throw ApiProblem.badRequest("At most " + MAX_SIGNALS + " signals per regression; got " + signalsNode.size() + ".");
        }
        Map<String, Recipe> signals = new LinkedHashMap<>();
        List<String> signalProblems = new ArrayList<>();
        for (Iterator<Map.Entry<String, JsonNode>> it = signalsNode.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            Names.check("Signal", e.getKey());
            Recipe recipe = RecipeJson.read(e.getValue(), "signals." + e.getKey(), signalProblems);
            if (recipe != null) {
                signals.put(e.getKey(), recipe);
            }
        }
        if (!signalProblems.isEmpty()) {
            throw ApiProblem.badRequest("Field 'signals' is not valid: " + String.join("; ", signalProblems) + ".");
        }
        Integer lag = Requests.intField(body, "lag", 1, 1000);
        JsonNode standardize = body.get("standardize");
        if (standardize != null && !standardize.isNull() && !standardize.isBoolean()) {
            throw ApiProblem.badRequest("Field 'standardize' must be true or false, got " + standardize + ".");
        }
        JsonNode weightingNode = body.get("weighting");
        FamaMacBethStudy.Weighting weighting = FamaMacBethStudy.Weighting.EQUAL;
        if (weightingNode != null && !weightingNode.isNull()) {
            weighting = switch (weightingNode.asText()) {
                case "equal" -> FamaMacBethStudy.Weighting.EQUAL;
                case "cap" -> FamaMacBethStudy.Weighting.CAP;
                default -> throw ApiProblem.badRequest("Field 'weighting' must be equal or cap, got " + weightingNode + ".");
            };
        }
        List<String> problems = new ArrayList<>();
        Universe universe = DefinitionJson.readUniverse(body.get("universe"), problems);
        if (!problems.isEmpty()) {
            throw ApiProblem.badRequest("Field 'universe' is not valid: " + String.join("; ", problems) + ".");
        }
        LocalDate from = Requests.dateField(body, "from");
        LocalDate to = Requests.dateField(body, "to");
        Requests.checkRange(from, to);
        return new FamaMacBethStudy.Request(panel, signals, lag == null ? 1 : lag,
                standardize != null && standardize.asBoolean(), weighting, universe, from, to);
    }

    /** {@code GET /v1/model-tests?factors=&assets=&risk_free=&from=&to=}. */
    void modelTests(Context ctx) {
        List<String> factors = nameList(ctx, "factors");
        List<String> assets = nameList(ctx, "assets");
        String riskFree = ctx.queryParam("risk_free");
        riskFree = riskFree == null || riskFree.isBlank() ? null : riskFree.trim();
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        FactorModelTest.OnSeries result = modelTests.run(new ModelTests.Request(factors, assets, riskFree, from, to));
        Json.respond(ctx, CrossSectionWire.ModelTest.of(factors, assets, riskFree, result));
    }

    private static List<String> nameList(Context ctx, String parameter) {
        List<String> names = Requests.listParam(ctx, parameter);
        if (names == null || names.isEmpty()) {
            throw ApiProblem.badRequest("Query parameter '" + parameter + "' is required: series names separated by commas"
                    + " (a factor, or factor:portfolio for one of its portfolios).");
        }
        if (names.size() > MAX_MODEL_SERIES) {
            throw ApiProblem.badRequest("At most " + MAX_MODEL_SERIES + " names in '" + parameter + "'; got " + names.size() + ".");
        }
        return names;
    }
}
