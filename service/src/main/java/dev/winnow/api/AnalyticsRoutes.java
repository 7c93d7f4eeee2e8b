package dev.winnow.api;

import dev.winnow.construct.FactorDefinition;
import dev.winnow.research.StoredCosts;
import dev.winnow.stats.CorrelationMatrix;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.DrawdownReport;
import dev.winnow.stats.Drawdowns;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.RollingCorrelation;
import dev.winnow.stats.RollingSignificance;
import dev.winnow.stats.Summary;
import dev.winnow.stats.SummaryStatistics;
import dev.winnow.stats.TradingCosts;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Summary statistics, drawdowns, rolling significance and correlations over stored series. */
final class AnalyticsRoutes {
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
            SeriesRequest.Resolved resolved = request.loadNonEmpty(factors);
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
        SeriesRequest.Resolved resolved = request.loadNonEmpty(factors);
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
        SeriesRequest.Resolved resolved = request.loadNonEmpty(factors);
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
        CorrelationRequest request = CorrelationRequest.of(ctx, factors, 2);
        CorrelationMatrix m = Correlations.matrix(request.series(), request.method());
        request.rejectEmptyOverlap(m.observations());
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factors", request.names());
        out.put("method", request.methodName());
        out.put("matrix", m.matrix());
        out.put("observations", m.observations());
        Json.respond(ctx, out);
    }

    void rollingCorrelation(Context ctx) {
        CorrelationRequest request = CorrelationRequest.of(ctx, factors, 2);
        List<String> names = request.names();
        if (names.size() != 2) {
            throw ApiProblem.badRequest("Rolling correlation takes exactly two factors, as factors=a,b; got " + names.size() + ".");
        }
        Integer window = Requests.intParam(ctx, "window", 3, 1_000_000);
        if (window == null) {
            throw ApiProblem.badRequest("Query parameter 'window' is required: the number of common observations per window (at least 3).");
        }
        List<ReturnSeries> series = request.series();
        int common = Correlations.matrix(series, request.method()).observations()[0][1];
        if (common < window) {
            throw ApiProblem.badRequest("The two series share " + common + " dates in range, fewer than window " + window
                    + "; choose a smaller window or a wider range.");
        }
        RollingCorrelation rolling = Correlations.rolling(series.get(0), series.get(1), window, request.method());
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factors", names);
        out.put("method", request.methodName());
        out.put("window", window);
        out.put("dates", rolling.dates());
        out.put("values", rolling.values());
        Json.respond(ctx, out);
    }

    static Integer lagsParam(Context ctx) {
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
        if (v.method() == FactorDefinition.Method.EXTERNAL) {
            return out;
        }
        ReturnSeries range = resolved.series();
        TradingCosts costs = StoredCosts.of(factors, v, range.date(0), range.date(range.size() - 1));
        out.put("average_annual_turnover", costs.averageAnnualTurnover());
        out.put("break_even_cost_bps", costs.breakEvenCostBps());
        return out;
    }
}
