package dev.winnow.api;

import dev.winnow.construct.PortfolioExposure;
import dev.winnow.research.LoadingsService;
import dev.winnow.stats.FactorCovariance;
import dev.winnow.stats.PortfolioRisk;
import dev.winnow.store.PanelStore;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.SeriesAlignment;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Leg;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/** The risk system's reads: the whole library aligned on dates in one answer, the factor covariance, portfolio risk. */
final class LibraryRoutes {
    private final FactorStore factors;
    private final ServedResponses served;
    private final LoadingsService loadings;
    private final PanelStore panels;

    LibraryRoutes(FactorStore factors, PanelStore panels, ServedResponses served, LoadingsService loadings) {
        this.factors = factors;
        this.panels = panels;
        this.served = served;
        this.loadings = loadings;
    }

    /** {@code GET /v1/returns}: every named factor converted to one frequency, then aligned on dates. */
    void returns(Context ctx) {
        FactorSet set = FactorSet.of(factors, Requests.listParam(ctx, "factors"), "factors", true, 1);
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        String form = Requests.choiceParam(ctx, "form", List.of("period", "cumulative"), "period");
        Leg leg = Requests.booleanParam(ctx, "net") ? Leg.NET : Leg.SPREAD;
        SeriesAlignment.Join join = Requests.choiceParam(ctx, "join", List.of("outer", "inner"), "outer").equals("inner")
                ? SeriesAlignment.Join.INNER : SeriesAlignment.Join.OUTER;
        boolean csv = Responses.wantsCsv(ctx);
        served.respond(ctx, set.dataKey(), csv, () -> {
            FactorSet.Loaded loaded = set.load(factors, leg, from, to, target);
            List<ReturnSeries> series = new ArrayList<>();
            for (ReturnSeries s : loaded.series()) {
                series.add(form.equals("cumulative") ? FrequencyConversion.cumulative(s) : s);
            }
            SeriesAlignment.Aligned aligned = SeriesAlignment.align(series, join);
            return csv ? Responses.csvBody(alignedCsv(set.names(), aligned)) : Responses.jsonBody(alignedJson(loaded, join, aligned));
        });
    }

    private static Map<String, Object> alignedJson(FactorSet.Loaded loaded, SeriesAlignment.Join join, SeriesAlignment.Aligned aligned) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("frequency", loaded.frequency() == null ? null : loaded.frequency().wireName());
        out.put("join", join.name().toLowerCase(Locale.ROOT));
        List<Map<String, Object>> described = new ArrayList<>();
        Map<String, Object> returns = new LinkedHashMap<>();
        for (int i = 0; i < loaded.versions().size(); i++) {
            FactorVersionRecord v = loaded.versions().get(i);
            Map<String, Object> d = new LinkedHashMap<>();
            d.put("name", v.name());
            d.put("version", v.version());
            d.put("data_version", v.dataVersion());
            described.add(d);
            returns.put(v.name(), aligned.values()[i]);
        }
        out.put("factors", described);
        out.put("dates", aligned.dates());
        out.put("returns", returns);
        return out;
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

    /** {@code GET /v1/covariance}: the weighted, optionally Newey-West adjusted factor covariance. */
    void covariance(Context ctx) {
        FactorSet set = FactorSet.of(factors, Requests.listParam(ctx, "factors"), "factors", false, 1);
        CovarianceSettings settings = CovarianceSettings.ofQuery(ctx);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        String annualizeText = ctx.queryParam("annualize");
        boolean annualize = annualizeText == null || annualizeText.isBlank() || Requests.booleanParam(ctx, "annualize");
        boolean csv = Responses.wantsCsv(ctx);
        served.respond(ctx, set.dataKey(), csv, () -> {
            Covariance c = Covariance.of(set.load(factors, Leg.SPREAD, null, settings.to(), target), settings, annualize);
            return csv ? Responses.csvBody(matrixCsv(set.names(), c.estimate().covariance())) : Responses.jsonBody(c.json(set.names()));
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

    /**
     * {@code POST /v1/risk}: the active weights' exposures from the securities' loadings, F the annualised factor
     * covariance at the panel's frequency over the last common date at or before the request's date, the specific
     * variance periods-per-year x sum_i w_i^2 s_i^2 over the securities with loadings, and the decomposition of
     * {@link PortfolioRisk}.
     */
    void risk(Context ctx) {
        RiskRequest request = RiskRequest.of(ctx, panels);
        LoadingsService.RiskInputs inputs = loadings.riskInputs(request.panel(), request.date(), request.securities(),
                request.activeWeights(), request.regression(), source -> ctx.header(LoadingsRoutes.SOURCE_HEADER, source));
        Frequency frequency = Optional.ofNullable(Frequency.fromWireName(request.panel().frequency())).orElse(Frequency.DAILY);
        Covariance covariance = Covariance.of(new FactorSet(inputs.versions()).load(factors, Leg.SPREAD, null, request.date(), frequency),
                request.covariance(), true);
        double specific = PortfolioRisk.specificVariance(inputs.coveredWeights(), inputs.residualVols(), frequency.periodsPerYear());
        PortfolioExposure exposure = inputs.exposures().exposure();
        PortfolioRisk risk;
        try {
            risk = PortfolioRisk.of(exposure.exposures(), covariance.estimate().covariance(), specific);
        } catch (IllegalArgumentException e) {
            throw ApiProblem.badRequest("The portfolio's risk cannot be decomposed: " + e.getMessage()
                    + " (active weights all zero, or a covariance that is not positive for these exposures).");
        }
        Json.respond(ctx, riskJson(inputs.exposures(), risk));
    }

    private static Map<String, Object> riskJson(LoadingsService.Exposures answer, PortfolioRisk r) {
        double[] exposures = answer.exposure().exposures();
        List<String> names = answer.spec().factors();
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", answer.panel().name());
        out.put("date", answer.date());
        out.put("factors", names);
        out.put("exposures", exposures);
        out.put("total_volatility", r.totalVolatility());
        out.put("factor_volatility", r.factorVolatility());
        out.put("specific_volatility", r.specificVolatility());
        List<Map<String, Object>> contributions = new ArrayList<>();
        for (int k = 0; k < exposures.length; k++) {
            Map<String, Object> c = new LinkedHashMap<>();
            c.put("factor", names.get(k));
            c.put("exposure", exposures[k]);
            c.put("marginal", r.marginal()[k]);
            c.put("contribution", r.contributions()[k]);
            c.put("share", r.shares()[k]);
            contributions.add(c);
        }
        out.put("contributions", contributions);
        out.put("specific_contribution", r.specificContribution());
        out.put("specific_share", r.specificShare());
        out.put("coverage", answer.exposure().coverage());
        out.put("missing", answer.exposure().missingHoldings().stream().map(answer.securities()::get).toList());
        return out;
    }

    /** The sample, the settings and the estimate of one covariance answer. */
    record Covariance(Frequency frequency, LocalDate first, LocalDate last, int observations, CovarianceSettings settings,
                      boolean annualized, FactorCovariance.Estimate estimate) {

        /**
         * The last {@code window} common dates (all when null) of the loaded series, and the estimate over them;
         * a sample the estimate cannot use is a problem that says what to change.
         */
        static Covariance of(FactorSet.Loaded loaded, CovarianceSettings settings, boolean annualize) {
            SeriesAlignment.Aligned common = SeriesAlignment.align(loaded.series(), SeriesAlignment.Join.INNER);
            int n = common.size();
            int start = settings.window() == null ? 0 : Math.max(0, n - settings.window());
            int count = n - start;
            if (count < 2) {
                throw ApiProblem.badRequest("The factors share " + count + " date(s)" + (settings.to() != null ? " up to " + settings.to() : "")
                        + "; a covariance needs at least 2. Choose factors that overlap or a later 'to'.");
            }
            if (settings.nwLags() >= count) {
                throw ApiProblem.badRequest("nw_lags " + settings.nwLags() + " must be smaller than the " + count
                        + " observations in the sample; choose fewer lags or a longer window.");
            }
            int k = loaded.series().size();
            double[][] x = new double[count][k];
            for (int t = 0; t < count; t++) {
                for (int i = 0; i < k; i++) {
                    x[t][i] = common.values()[i][start + t];
                }
            }
            FactorCovariance.Estimate e = FactorCovariance.estimate(x, settings.halfLife(), settings.nwLags());
            if (annualize) {
                e = e.annualized(loaded.frequency().periodsPerYear());
            }
            return new Covariance(loaded.frequency(), common.dates()[start], common.dates()[n - 1], count, settings, annualize, e);
        }

        Map<String, Object> json(List<String> names) {
            Map<String, Object> out = new LinkedHashMap<>();
            out.put("factors", names);
            out.put("frequency", frequency.wireName());
            out.put("first", first);
            out.put("last", last);
            out.put("observations", observations);
            out.put("half_life", settings.halfLife());
            out.put("nw_lags", settings.nwLags());
            out.put("annualized", annualized);
            out.put("covariance", estimate.covariance());
            out.put("volatility", estimate.volatility());
            out.put("correlation", estimate.correlation());
            return out;
        }
    }
}
