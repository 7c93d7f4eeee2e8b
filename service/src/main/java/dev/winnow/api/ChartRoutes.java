package dev.winnow.api;

import dev.winnow.charts.BarChart;
import dev.winnow.charts.ChartFrame;
import dev.winnow.charts.Heatmap;
import dev.winnow.charts.Palette;
import dev.winnow.charts.TimeChart;
import dev.winnow.charts.TimeChart.Band;
import dev.winnow.charts.TimeChart.DateMarker;
import dev.winnow.charts.TimeChart.Line;
import dev.winnow.charts.TimeChart.Point;
import dev.winnow.charts.TimeChart.Rule;
import dev.winnow.charts.TimeChart.Style;
import dev.winnow.charts.ValueAxis;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.stats.CorrelationMatrix;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.DrawdownReport;
import dev.winnow.stats.Drawdowns;
import dev.winnow.research.FactorPortfolios;
import dev.winnow.research.InformationCoefficients;
import dev.winnow.stats.EstimateSeries;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.PeriodStatistics;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.RollingSignificance;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Leg;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Charts as SVG documents of the numbers the JSON endpoints serve: each handler reads its input through the same
 * request records ({@link SeriesRequest}, {@link CorrelationRequest}) and computes with the same functions as the
 * endpoint whose numbers it draws, then hands plain values to {@code dev.winnow.charts}.
 */
final class ChartRoutes {
    static final String SVG = "image/svg+xml";

    private final FactorStore factors;
    private final FactorPortfolios portfolios;
    private final InformationCoefficients informationCoefficients;

    ChartRoutes(FactorStore factors, FactorPortfolios portfolios, InformationCoefficients informationCoefficients) {
        this.factors = factors;
        this.portfolios = portfolios;
        this.informationCoefficients = informationCoefficients;
    }

    /** The wealth index 1 + cumulative return of the spread (or net spread), with the legs as thinner lines. */
    void cumulative(Context ctx) {
        Requests.rejectParams(ctx, "the cumulative chart, which draws the spread and both legs", "leg");
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        boolean log = Requests.booleanParam(ctx, "log");
        Size size = Size.of(ctx);
        if (Responses.notModified(ctx, request.version(), false)) {
            return;
        }
        SeriesRequest.Resolved spread = request.loadNonEmpty(factors);
        boolean net = request.leg() == Leg.NET;
        List<Line> lines = new ArrayList<>();
        String name = request.version().name();
        lines.add(wealthLine("spread", net ? "spread, net of costs" : "spread", spread.series(), Palette.SPREAD, Style.MAIN, log));
        for (Leg leg : List.of(Leg.LONG, Leg.SHORT)) {
            ReturnSeries s = new SeriesRequest(request.version(), leg, request.from(), request.to(), request.targetFrequency()).load(factors).series();
            if (s.size() > 0) {
                boolean isLong = leg == Leg.LONG;
                lines.add(wealthLine(isLong ? "long" : "short", (isLong ? "long leg" : "short leg") + (net ? " (gross)" : ""), s,
                        isLong ? Palette.LONG : Palette.SHORT, isLong ? Style.THIN_DASHED : Style.THIN_DOTTED, log));
            }
        }
        ReturnSeries s = spread.series();
        double end = 1 + FrequencyConversion.cumulative(s).value(s.size() - 1);
        String desc = "Wealth index (1 at the start, before the first return) of factor " + name + " version "
                + request.version().version() + ", " + (net ? "net of trading costs" : "gross of trading costs") + ", "
                + spread.frequency().wireName() + " returns from " + s.date(0) + " to " + s.date(s.size() - 1)
                + (log ? ", on a log scale" : "") + "; the spread ends at " + String.format(java.util.Locale.ROOT, "%.3f", end)
                + (lines.size() > 1 ? "; the long and short legs are the thinner dashed and dotted lines" : "") + ".";
        TimeChart chart = new TimeChart("Wealth index (1 = start)" + (log ? ", log scale" : ""), ValueAxis.Format.NUMBER, log, lines,
                List.of(new Rule(1.0, "start")), List.of(), List.of(), List.of(), List.of());
        respond(ctx, chart.render(size.frame("Cumulative return of " + name, desc, ctx.res().getHeader("ETag"))));
    }

    private static Line wealthLine(String key, String label, ReturnSeries series, String colour, Style style, boolean log) {
        ReturnSeries cumulative = FrequencyConversion.cumulative(series);
        double[] wealth = cumulative.values();
        for (int i = 0; i < wealth.length; i++) {
            wealth[i] += 1.0;
            if (log && !(wealth[i] > 0)) {
                throw ApiProblem.badRequest("The " + label + " wealth index reaches " + wealth[i] + " on " + cumulative.date(i)
                        + "; a log scale cannot show zero or less, so drop log=true.");
            }
        }
        return new Line(key, label, cumulative.dates(), wealth, colour, style);
    }

    /** The underwater curve as a filled area, the deepest episodes shaded and their troughs marked. */
    void drawdowns(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        int top = orDefault(Requests.intParam(ctx, "top", 1, 1000), 5);
        Size size = Size.of(ctx);
        if (Responses.notModified(ctx, request.version(), false)) {
            return;
        }
        SeriesRequest.Resolved resolved = request.loadNonEmpty(factors);
        DrawdownReport report = Drawdowns.analyze(resolved.series(), top);
        LocalDate[] dates = report.underwaterDates();
        List<Point> troughs = new ArrayList<>();
        List<Band> bands = new ArrayList<>();
        int rank = 1;
        for (DrawdownReport.Episode e : report.episodes()) {
            String depth = percent(e.depth());
            troughs.add(new Point(e.trough(), e.depth(), rank + ": " + depth + " at " + e.trough() + ", " + e.duration() + " periods under water"
                    + (e.recovery() == null ? ", not recovered" : ", recovered " + e.recovery())));
            LocalDate start = e.peak() == null ? dates[0] : e.peak();
            LocalDate stop = e.recovery() == null ? dates[dates.length - 1] : e.recovery();
            bands.add(new Band(start, stop, "Episode " + rank + ": from " + start + " to " + stop));
            rank++;
        }
        String name = request.version().name();
        String desc = "Drawdown below the running peak of the wealth index of factor " + name + " version " + request.version().version()
                + " (" + request.leg().name().toLowerCase(java.util.Locale.ROOT) + ", " + resolved.frequency().wireName() + ") from "
                + dates[0] + " to " + dates[dates.length - 1] + "; the maximum drawdown is " + percent(report.maxDrawdown())
                + (troughs.isEmpty() ? "" : "; the " + troughs.size() + " deepest episodes are shaded and their troughs numbered") + ".";
        TimeChart chart = new TimeChart("Drawdown (% below running peak)", ValueAxis.Format.PERCENT, false,
                List.of(new Line("underwater", "drawdown", dates, report.underwater(), Palette.SHORT, Style.AREA)),
                List.of(), List.of(), troughs, bands, List.of(0.0));
        respond(ctx, chart.render(size.frame("Drawdowns of " + name, desc, ctx.res().getHeader("ETag"))));
    }

    /** The rolling Newey-West t of the mean, reference lines at +threshold and -threshold, found_on marked. */
    void significance(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        Integer window = Requests.intParam(ctx, "window", 3, 1_000_000);
        Integer lags = AnalyticsRoutes.lagsParam(ctx);
        Double threshold = Requests.doubleParam(ctx, "threshold");
        double hurdle = threshold == null ? 2.0 : Math.abs(threshold);
        Size size = Size.of(ctx);
        if (Responses.notModified(ctx, request.version(), false)) {
            return;
        }
        SeriesRequest.Resolved resolved = request.loadNonEmpty(factors);
        ReturnSeries series = resolved.series();
        int ppy = resolved.frequency().periodsPerYear();
        int w = window != null ? window : defaultWindow(ppy, series.size());
        if (w > series.size()) {
            throw ApiProblem.badRequest("window " + w + " is larger than the " + series.size()
                    + " observations in range; choose a window of at most " + series.size() + ".");
        }
        RollingSignificance rolling = RollingSignificance.compute(series, w, ppy, lags);
        List<DateMarker> markers = new ArrayList<>();
        DefinitionJson.Parsed parsed = DefinitionJson.read(request.version().definitionJson());
        LocalDate foundOn = parsed.ok() ? parsed.definition().foundOn() : null;
        LocalDate[] windowEnds = rolling.dates();
        boolean foundOnShown = foundOn != null && !foundOn.isBefore(windowEnds[0]) && !foundOn.isAfter(windowEnds[windowEnds.length - 1]);
        if (foundOnShown) {
            markers.add(new DateMarker(foundOn, "found on " + foundOn));
        }
        String name = request.version().name();
        String desc = "Newey-West t-statistic of the mean " + resolved.frequency().wireName() + " return of factor " + name
                + " version " + request.version().version() + " over rolling windows of " + w + " observations (" + rolling.lags()
                + " lags), windows ending from " + windowEnds[0] + " to " + windowEnds[windowEnds.length - 1]
                + "; dashed reference lines at +" + hurdle + " and -" + hurdle
                + (foundOnShown ? "; a vertical marker at the declared discovery date " + foundOn
                : foundOn != null ? "; the declared discovery date " + foundOn + " is outside the windows drawn" : "") + ".";
        TimeChart chart = new TimeChart("Rolling Newey-West t-statistic (window " + w + ")", ValueAxis.Format.NUMBER, false,
                List.of(new Line("nw_t_stat", "Newey-West t", rolling.dates(), rolling.nwTStat(), Palette.SPREAD, Style.MAIN)),
                List.of(new Rule(hurdle, "+" + hurdle), new Rule(-hurdle, "\u2212" + hurdle)), markers, List.of(), List.of(), List.of());
        respond(ctx, chart.render(size.frame("Rolling significance of " + name, desc, ctx.res().getHeader("ETag"))));
    }

    /**
     * Five years of periods (common practice for rolling estimates), or half the observations when there are fewer
     * than ten years of them, but at least three.
     */
    static int defaultWindow(int periodsPerYear, int observations) {
        int fiveYears = 5 * periodsPerYear;
        int w = observations >= 2 * fiveYears ? fiveYears : observations / 2;
        return Math.max(3, w);
    }

    /** The correlation matrix as a heatmap with the coefficients written in the cells. */
    void correlations(Context ctx) {
        CorrelationRequest request = CorrelationRequest.of(ctx, factors, 2);
        Size size = Size.of(ctx);
        if (Responses.notModified(ctx, request.dataKey(), false)) {
            return;
        }
        CorrelationMatrix m = Correlations.matrix(request.series(), request.method());
        request.rejectEmptyOverlap(m.observations());
        String method = request.method() == Correlations.Method.SPEARMAN ? "Spearman" : "Pearson";
        String desc = method + " correlations of the spreads of " + String.join(", ", request.names())
                + " on their common dates (pairwise), each coefficient written in its cell; blue is negative, orange positive.";
        Heatmap chart = new Heatmap(request.names(), m.matrix(), method + " correlation");
        respond(ctx, chart.render(size.frame(method + " correlations", desc, ctx.res().getHeader("ETag"))));
    }

    /**
     * The mean return of each stored portfolio of the factor (the buckets of a sort, the six of a size_sort) as a bar,
     * with its Newey-West t written beside it: the portfolios {@code GET /v1/factors/{factor}/portfolios} serves for
     * the same {@code from}, {@code to}, {@code frequency} and {@code version}, each summarised by
     * {@link PeriodStatistics#of} over the dates it has a return (as the monotonicity section of the evidence does).
     */
    void portfolios(Context ctx) {
        Requests.rejectParams(ctx, "the portfolios chart (portfolios have no net or leg form)", "net", "leg", "form");
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        SeriesRequest.Window window = SeriesRequest.Window.of(ctx);
        Size size = Size.of(ctx);
        if (Responses.notModified(ctx, v, false)) {
            return;
        }
        FactorPortfolios.Table table = portfolios.table(v, window.from(), window.to(), window.target(), false);
        if (table.dates().isEmpty()) {
            throw ApiProblem.badRequest("Factor '" + v.name() + "' has no portfolio returns"
                    + (window.from() != null || window.to() != null ? " between the requested dates" : " yet (status " + v.status().wireName() + ")")
                    + "; widen 'from'/'to' or wait for its build.");
        }
        List<BarChart.Bar> bars = new ArrayList<>();
        for (int k = 0; k < table.names().size(); k++) {
            PeriodStatistics p = PeriodStatistics.of(withoutGaps(table.dates(), table.returns().get(k)));
            bars.add(new BarChart.Bar(table.names().get(k), p.mean(), tNote(p.nwTStat())));
        }
        String desc = "Mean " + table.frequency().wireName() + " return of each portfolio of factor " + v.name() + " version "
                + v.version() + " (" + String.join(", ", table.names()) + ") from " + table.dates().get(0) + " to "
                + table.dates().get(table.dates().size() - 1) + ", each bar labelled with the Newey-West t-statistic of its mean.";
        BarChart chart = new BarChart("Portfolio", "Mean " + table.frequency().wireName() + " return (%)", ValueAxis.Format.PERCENT,
                bars, Palette.SPREAD);
        respond(ctx, chart.render(size.frame("Portfolios of " + v.name(), desc, ctx.res().getHeader("ETag"))));
    }

    /** The dated values that are defined. */
    private static ReturnSeries withoutGaps(List<LocalDate> dates, double[] values) {
        List<LocalDate> d = new ArrayList<>();
        List<Double> r = new ArrayList<>();
        for (int t = 0; t < values.length; t++) {
            if (Double.isFinite(values[t])) {
                d.add(dates.get(t));
                r.add(values[t]);
            }
        }
        return new ReturnSeries(d.toArray(LocalDate[]::new), r.stream().mapToDouble(Double::doubleValue).toArray());
    }

    /**
     * The mean information coefficient at each horizon as a bar, with the Newey-West t of that mean written beside
     * it: the {@code summary} {@code GET /v1/factors/{factor}/ic} serves for the same {@code horizons},
     * {@code method}, {@code min_securities}, {@code from}, {@code to} and {@code version} (computed by the same
     * {@link InformationCoefficients#run}). The IC is on the panel's grid, so {@code frequency}, {@code net},
     * {@code leg} and {@code form} do not apply.
     */
    void ic(Context ctx) {
        Requests.rejectParams(ctx, "the ic chart (information coefficients are on the panel's grid, gross, of the signal)",
                "frequency", "net", "leg", "form");
        IcRequest request = IcRequest.of(ctx, factors);
        Size size = Size.of(ctx);
        FactorVersionRecord v = request.version();
        if (Responses.notModified(ctx, v, false)) {
            return;
        }
        InformationCoefficients.Result r = informationCoefficients.run(request.study());
        if (r.dates().isEmpty()) {
            throw ApiProblem.badRequest("Factor '" + v.name() + "' has no panel dates between the requested dates;"
                    + " widen 'from'/'to'.");
        }
        List<BarChart.Bar> bars = new ArrayList<>();
        List<String> horizons = new ArrayList<>();
        for (int k = 0; k < r.horizons().size(); k++) {
            EstimateSeries s = r.summary().get(k);
            String h = String.valueOf(r.horizons().get(k));
            horizons.add(h);
            bars.add(new BarChart.Bar(h, s.mean(), tNote(s.nwTStat())));
        }
        String method = r.method() == Correlations.Method.SPEARMAN ? "Spearman" : "Pearson";
        String desc = "Mean " + method + " information coefficient of the signal of factor " + v.name() + " version " + v.version()
                + " with the one-period return h grid periods later, for h = " + String.join(", ", horizons) + ", over formation dates from "
                + r.dates().get(0) + " to " + r.dates().get(r.dates().size() - 1) + " with at least " + request.study().minSecurities()
                + " securities; each bar is labelled with the Newey-West t-statistic of its mean (the raw signal is used, so a"
                + " low_minus_high factor that works has negative bars).";
        BarChart chart = new BarChart("Horizon (grid periods ahead)", "Mean " + method + " IC (correlation)", ValueAxis.Format.NUMBER,
                bars, Palette.SPREAD);
        respond(ctx, chart.render(size.frame("Information coefficients of " + v.name(), desc, ctx.res().getHeader("ETag"))));
    }

    /** A t-statistic as written beside a bar: two decimals, a true minus sign, "n/a" when undefined. */
    private static String tNote(double t) {
        return Double.isFinite(t) ? "t " + String.format(Locale.ROOT, "%.2f", t).replace('-', '\u2212') : "t n/a";
    }

    private static void respond(Context ctx, String svg) {
        ctx.status(200).contentType(SVG + "; charset=utf-8").result(svg);
    }

    private static String percent(double fraction) {
        return String.format(java.util.Locale.ROOT, "%.1f%%", 100 * fraction);
    }

    private static int orDefault(Integer value, int fallback) {
        return value == null ? fallback : value;
    }

    /** {@code width} and {@code height} in pixels, within the limits of {@link ChartFrame}. */
    record Size(int width, int height) {
        static Size of(Context ctx) {
            Integer w = Requests.intParam(ctx, "width", ChartFrame.MIN_WIDTH, ChartFrame.MAX_WIDTH);
            Integer h = Requests.intParam(ctx, "height", ChartFrame.MIN_HEIGHT, ChartFrame.MAX_HEIGHT);
            return new Size(w == null ? ChartFrame.DEFAULT_WIDTH : w, h == null ? ChartFrame.DEFAULT_HEIGHT : h);
        }

        ChartFrame frame(String title, String description, String etag) {
            return new ChartFrame(width, height, title, description, etag);
        }
    }
}
