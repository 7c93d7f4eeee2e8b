package dev.winnow.api;

import dev.winnow.stats.CorrelationMatrix;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.DrawdownReport;
import dev.winnow.stats.Drawdowns;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.RollingCorrelation;
import dev.winnow.stats.RollingSignificance;
import dev.winnow.stats.Summary;
import dev.winnow.stats.SummaryStatistics;
import dev.winnow.stats.TradingCosts;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/** Summary statistics, drawdowns, rolling significance and correlations over stored series. */
final class AnalyticsRoutes {
    private static final int MAX_CORRELATION_FACTORS = 200;

    private final FactorStore factors;
    private final ServedResponses served;

    AnalyticsRoutes(FactorStore factors, ServedResponses served) {
        this.factors = factors;
        this.served = served;
    }

    void summary(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        Integer lags = lagsParam(ctx);
        served.respond(ctx, Responses.dataKey(request.version()), false, () -> {
            SeriesRequest.Resolved resolved = nonEmpty(request);
            Map<String, Object> out = new LinkedHashMap<>();
            out.put("factor", request.version().name());
            out.put("version", request.version().version());
            out.put("frequency", resolved.frequency().wireName());
            out.put("from", resolved.series().date(0));
            out.put("to", resolved.series().date(resolved.series().size() - 1));
            out.putAll(summaryFields(SummaryStatistics.of(resolved.series().values(), resolved.frequency().periodsPerYear(), lags)));
            out.putAll(costFields(request.version(), resolved));
            return Responses.jsonBody(out);
        });
    }

    void drawdowns(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        int top = orDefault(Requests.intParam(ctx, "top", 1, 1000), 5);
        if (Responses.notModified(ctx, request.version(), false)) {
            return;
        }
        SeriesRequest.Resolved resolved = nonEmpty(request);
        DrawdownReport report = Drawdowns.analyze(resolved.series(), top);
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factor", request.version().name());
        out.put("version", request.version().version());
        out.put("frequency", resolved.frequency().wireName());
        out.put("max_drawdown", report.maxDrawdown());
        out.put("underwater", Map.of("dates", report.underwaterDates(), "values", report.underwater()));
        List<Map<String, Object>> episodes = new ArrayList<>();
        for (var e : report.episodes()) {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("peak", e.peak());
            m.put("trough", e.trough());
            m.put("recovery", e.recovery());
            m.put("depth", e.depth());
            m.put("duration", e.duration());
            episodes.add(m);
        }
        out.put("episodes", episodes);
        Json.respond(ctx, out);
    }

    void significance(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        Integer window = Requests.intParam(ctx, "window", 3, 1_000_000);
        if (window == null) {
            throw ApiProblem.badRequest("Query parameter 'window' is required: the number of observations in each rolling window (at least 3).");
        }
        Integer lags = lagsParam(ctx);
        Double threshold = Requests.doubleParam(ctx, "threshold");
        double hurdle = threshold == null ? 2.0 : threshold;
        if (Responses.notModified(ctx, request.version(), false)) {
            return;
        }
        SeriesRequest.Resolved resolved = nonEmpty(request);
        ReturnSeries series = resolved.series();
        if (window > series.size()) {
            throw ApiProblem.badRequest("window " + window + " is larger than the " + series.size()
                    + " observations in range; choose a window of at most " + series.size() + ".");
        }
        int ppy = resolved.frequency().periodsPerYear();
        RollingSignificance rolling = RollingSignificance.compute(series, window, ppy, lags);
        Map<String, Object> roll = new LinkedHashMap<>();
        roll.put("window", window);
        roll.put("lags", rolling.lags());
        roll.put("dates", rolling.dates());
        roll.put("mean", rolling.mean());
        roll.put("t_stat", rolling.tStat());
        roll.put("nw_t_stat", rolling.nwTStat());
        roll.put("p_value", rolling.pValue());
        roll.put("sharpe_annual", rolling.sharpeAnnual());
        roll.put("threshold", hurdle);
        roll.put("share_above", rolling.shareAbove(hurdle));
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factor", request.version().name());
        out.put("version", request.version().version());
        out.put("frequency", resolved.frequency().wireName());
        out.put("summary", summaryFields(SummaryStatistics.of(series.values(), ppy, lags)));
        out.put("rolling", roll);
        Json.respond(ctx, out);
    }

    void correlations(Context ctx) {
        List<String> names = factorList(ctx, 2);
        Correlations.Method method = methodParam(ctx);
        List<ReturnSeries> series = loadAll(ctx, names);
        CorrelationMatrix m = Correlations.matrix(series, method);
        rejectEmptyOverlap(names, m.observations());
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factors", names);
        out.put("method", method.name().toLowerCase(Locale.ROOT));
        out.put("matrix", m.matrix());
        out.put("observations", m.observations());
        Json.respond(ctx, out);
    }

    void rollingCorrelation(Context ctx) {
        List<String> names = factorList(ctx, 2);
        if (names.size() != 2) {
            throw ApiProblem.badRequest("Rolling correlation takes exactly two factors, as factors=a,b; got " + names.size() + ".");
        }
        Integer window = Requests.intParam(ctx, "window", 3, 1_000_000);
        if (window == null) {
            throw ApiProblem.badRequest("Query parameter 'window' is required: the number of common observations per window (at least 3).");
        }
        Correlations.Method method = methodParam(ctx);
        List<ReturnSeries> series = loadAll(ctx, names);
        int common = Correlations.matrix(series, method).observations()[0][1];
        if (common < window) {
            throw ApiProblem.badRequest("The two series share " + common + " dates in range, fewer than window " + window
                    + "; choose a smaller window or a wider range.");
        }
        RollingCorrelation rolling = Correlations.rolling(series.get(0), series.get(1), window, method);
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factors", names);
        out.put("method", method.name().toLowerCase(Locale.ROOT));
        out.put("window", window);
        out.put("dates", rolling.dates());
        out.put("values", rolling.values());
        Json.respond(ctx, out);
    }

    private List<ReturnSeries> loadAll(Context ctx, List<String> names) {
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        List<ReturnSeries> out = new ArrayList<>();
        for (String name : names) {
            FactorVersionRecord v = factors.catalog().current(name)
                    .orElseThrow(() -> ApiProblem.badRequest("Unknown factor '" + name + "' in 'factors'; GET /v1/factors lists them."));
            SeriesRequest.Resolved r = new SeriesRequest(v, FactorStore.Leg.SPREAD, from, to, target).load(factors);
            if (r.series().size() == 0) {
                throw ApiProblem.badRequest("Factor '" + name + "' has no observations in the requested range.");
            }
            out.add(r.series());
        }
        return out;
    }

    /** A pair without a single common date is a request that cannot be answered (400), not a null in the matrix. */
    private static void rejectEmptyOverlap(List<String> names, int[][] observations) {
        for (int i = 0; i < names.size(); i++) {
            for (int j = i + 1; j < names.size(); j++) {
                if (observations[i][j] == 0) {
                    throw ApiProblem.badRequest("Factors '" + names.get(i) + "' and '" + names.get(j) + "' have no dates in common"
                            + " in the requested range; leave one of them out or widen 'from'/'to'.");
                }
            }
        }
    }

    private static List<String> factorList(Context ctx, int min) {
        List<String> names = Requests.listParam(ctx, "factors");
        if (names == null || names.size() < min) {
            throw ApiProblem.badRequest("Query parameter 'factors' must list at least " + min + " factor names separated by commas.");
        }
        if (names.size() > MAX_CORRELATION_FACTORS) {
            throw ApiProblem.badRequest("At most " + MAX_CORRELATION_FACTORS + " factors per request; got " + names.size() + ".");
        }
        if (names.stream().distinct().count() != names.size()) {
            throw ApiProblem.badRequest("Query parameter 'factors' names a factor twice; list each once.");
        }
        return names;
    }

    private static Correlations.Method methodParam(Context ctx) {
        String m = Requests.choiceParam(ctx, "method", List.of("pearson", "spearman"), "pearson");
        return m.equals("spearman") ? Correlations.Method.SPEARMAN : Correlations.Method.PEARSON;
    }

    private SeriesRequest.Resolved nonEmpty(SeriesRequest request) {
        SeriesRequest.Resolved resolved = request.load(factors);
        if (resolved.series().size() == 0) {
            throw ApiProblem.badRequest("Factor '" + request.version().name() + "' has no observations"
                    + (request.from() != null || request.to() != null ? " between the requested dates" : " yet (status " + request.version().status() + ")")
                    + "; widen 'from'/'to' or wait for its build.");
        }
        return resolved;
    }

    private static Integer lagsParam(Context ctx) {
        String text = ctx.queryParam("lags");
        if (text == null || text.isBlank() || text.trim().equals("auto")) {
            return null;
        }
        return Requests.intParam(ctx, "lags", 0, 10_000);
    }

    private static int orDefault(Integer value, int fallback) {
        return value == null ? fallback : value;
    }

    static Map<String, Object> summaryFields(Summary s) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("n", s.n());
        out.put("mean", s.mean());
        out.put("stdev", s.stdev());
        out.put("annual_mean", s.annualMean());
        out.put("annual_volatility", s.annualVolatility());
        out.put("sharpe_annual", s.sharpeAnnual());
        out.put("skewness", s.skewness());
        out.put("kurtosis", s.kurtosis());
        out.put("best", s.best());
        out.put("worst", s.worst());
        out.put("hit_rate", s.hitRate());
        out.put("t_stat", s.tStat());
        out.put("nw_t_stat", s.nwTStat());
        out.put("nw_lags", s.nwLags());
        out.put("p_value", s.pValue());
        out.put("max_drawdown", s.maxDrawdown());
        return out;
    }

    /** Average annual turnover and break-even cost of the requested stretch, as {@link TradingCosts#of} defines them. */
    private Map<String, Object> costFields(FactorVersionRecord v, SeriesRequest.Resolved resolved) {
        Map<String, Object> out = new LinkedHashMap<>();
        if (v.method().equals("external")) {
            return out;
        }
        ReturnSeries range = resolved.series();
        TradingCosts costs = StoredCosts.of(factors, v, range.date(0), range.date(range.size() - 1));
        out.put("average_annual_turnover", costs.averageAnnualTurnover());
        out.put("break_even_cost_bps", costs.breakEvenCostBps());
        return out;
    }
}
