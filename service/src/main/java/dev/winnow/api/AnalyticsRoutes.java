package dev.winnow.api;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonUnwrapped;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
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

import java.time.LocalDate;
import java.util.List;

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
            TradingCosts costs = costs(request.version(), resolved);
            return Responses.jsonBody(new FactorSummary(request.version().name(), request.version().version(), resolved.frequency().wireName(),
                    resolved.series().date(0), resolved.series().date(resolved.series().size() - 1),
                    SummaryStatistics.of(resolved.series().values(), resolved.frequency().periodsPerYear(), lags),
                    costs == null ? null : costs.averageAnnualTurnover(), costs == null ? null : costs.breakEvenCostBps()));
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
        Json.respond(ctx, new FactorDrawdowns(request.version().name(), request.version().version(), resolved.frequency().wireName(),
                report.maxDrawdown(), new Underwater(report.underwaterDates(), report.underwater()), report.episodes()));
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
        Rolling roll = new Rolling(window, rolling.lags(), rolling.dates(), rolling.mean(), rolling.tStat(), rolling.nwTStat(),
                rolling.pValue(), rolling.sharpeAnnual(), hurdle, rolling.shareAbove(hurdle));
        Json.respond(ctx, new Significance(request.version().name(), request.version().version(), resolved.frequency().wireName(),
                SummaryStatistics.of(series.values(), ppy, lags), roll));
    }

    void correlations(Context ctx) {
        CorrelationRequest request = CorrelationRequest.of(ctx, factors, 2);
        CorrelationMatrix m = Correlations.matrix(request.series(), request.method());
        request.rejectEmptyOverlap(m.observations());
        Json.respond(ctx, new CorrelationAnswer(request.names(), request.methodName(), m.matrix(), m.observations()));
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
        Json.respond(ctx, new RollingCorrelationAnswer(names, request.methodName(), window, rolling.dates(), rolling.values()));
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

    /**
     * Average annual turnover and break-even cost of the requested stretch, as {@link TradingCosts#of} defines them;
     * null for an uploaded series, which has no turnover.
     */
    private TradingCosts costs(FactorVersionRecord v, SeriesRequest.Resolved resolved) {
        if (v.method() == FactorDefinition.Method.EXTERNAL) {
            return null;
        }
        ReturnSeries range = resolved.series();
        return StoredCosts.of(factors, v, range.date(0), range.date(range.size() - 1));
    }

    /**
     * {@code GET /v1/factors/{f}/summary}: the range, every {@link Summary} statistic at the top level, then the costs
     * (left out for an uploaded series).
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record FactorSummary(String factor, int version, String frequency, LocalDate from, LocalDate to, @JsonUnwrapped Summary summary,
                         @JsonInclude(JsonInclude.Include.NON_NULL) Double averageAnnualTurnover,
                         @JsonInclude(JsonInclude.Include.NON_NULL) Double breakEvenCostBps) {
    }

    record Underwater(LocalDate[] dates, double[] values) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record FactorDrawdowns(String factor, int version, String frequency, double maxDrawdown, Underwater underwater,
                           List<DrawdownReport.Episode> episodes) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record Rolling(int window, int lags, LocalDate[] dates, double[] mean, double[] tStat, @JsonProperty("nw_t_stat") double[] nwTStat, double[] pValue,
                   double[] sharpeAnnual, double threshold, double shareAbove) {
    }

    record Significance(String factor, int version, String frequency, Summary summary, Rolling rolling) {
    }

    record CorrelationAnswer(List<String> factors, String method, double[][] matrix, int[][] observations) {
    }

    record RollingCorrelationAnswer(List<String> factors, String method, int window, LocalDate[] dates, double[] values) {
    }
}
