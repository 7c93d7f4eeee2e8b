package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Element;

import java.io.IOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Charts over HTTP on the demo store: each SVG is parsed by the JDK's XML parser and every plotted point is checked
 * against the JSON endpoint's numbers for the same parameters, mapped through the scale the chart declares (and the
 * ticks are checked to sit on that same scale), so a chart that draws other numbers, or draws them elsewhere than its
 * axes say, fails.
 */
class ChartsEndToEndTest {
    static TestServer server;

    @BeforeAll
    static void start() throws Exception {
        server = new TestServer();
        assertEquals(15, server.winnow().loadDemoIfEmpty().size());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    static SvgChart chart(String path) {
        TestServer.Reply r = server.get(path);
        assertEquals(200, r.status(), r.body());
        assertTrue(r.header("Content-Type").startsWith("image/svg+xml"), r.header("Content-Type"));
        String etag = r.header("ETag");
        assertTrue(etag != null && etag.startsWith("\""), "ETag " + etag);
        SvgChart chart = new SvgChart(r.body());
        chart.assertSelfContainedAndLabelled();
        assertTrue(chart.byId("chart-data").getTextContent().contains(etag), "the document names the ETag of its data");
        return chart;
    }

    static List<LocalDate> dates(JsonNode array) {
        List<LocalDate> out = new ArrayList<>();
        array.forEach(d -> out.add(LocalDate.parse(d.asText())));
        return out;
    }

    static double[] numbers(JsonNode array, double plus) {
        double[] out = new double[array.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = array.get(i).isNull() ? Double.NaN : array.get(i).asDouble() + plus;
        }
        return out;
    }

    @Test
    void cumulativeDrawsTheWealthIndexOfTheSpreadAndBothLegs() {
        String range = "from=2005-01-01&to=2019-12-31";
        SvgChart chart = chart("/v1/factors/value_quintile_cap/charts/cumulative?" + range + "&width=900&height=450");
        assertEquals("900", chart.root.getAttribute("width"));
        for (String leg : List.of("spread", "long", "short")) {
            JsonNode json = server.get("/v1/factors/value_quintile_cap/returns?form=cumulative&leg=" + leg + "&" + range).json();
            // the wealth index is 1 + the cumulative return the JSON serves
            chart.assertPlotted(leg, dates(json.path("dates")), numbers(json.path("returns"), 1.0));
            assertEquals(LocalDate.parse(json.path("dates").get(0).asText()), chart.day0);
        }
        chart.assertTicksOnScale();
        List<Element> legend = chart.withClass("legend-entry");
        assertEquals(List.of("spread", "long leg", "short leg"), legend.stream().map(Element::getTextContent).toList());
        assertTrue(chart.text("desc").contains("2005-01-31"), chart.text("desc"));
        // yearly ticks over fifteen years at this width: 2006, 2008, ... or every year, each on the first of January
        chart.withClass("x-tick").forEach(t -> assertTrue(t.getAttribute("data-date").endsWith("-01-01"), t.getAttribute("data-date")));
    }

    @Test
    void cumulativeOnALogScaleAndNetOfCosts() {
        SvgChart chart = chart("/v1/factors/momentum/charts/cumulative?log=true&net=true&frequency=quarterly");
        assertTrue(chart.log);
        JsonNode net = server.get("/v1/factors/momentum/returns?form=cumulative&net=true&frequency=quarterly").json();
        chart.assertPlotted("spread", dates(net.path("dates")), numbers(net.path("returns"), 1.0));
        JsonNode longLeg = server.get("/v1/factors/momentum/returns?form=cumulative&leg=long&frequency=quarterly").json();
        chart.assertPlotted("long", dates(longLeg.path("dates")), numbers(longLeg.path("returns"), 1.0));
        chart.assertTicksOnScale();
        for (Element t : chart.withClass("y-tick")) {
            double v = Double.parseDouble(t.getAttribute("data-value"));
            double mantissa = v / Math.pow(10, Math.floor(Math.log10(v) + 1e-9));
            assertTrue(Math.abs(mantissa - Math.rint(mantissa)) < 1e-9, "log ticks at whole multiples of powers of ten: " + v);
        }
        assertTrue(chart.text("desc").contains("net of trading costs"));
    }

    @Test
    void drawdownsDrawTheUnderwaterCurveAndMarkTheDeepestTroughs() {
        SvgChart chart = chart("/v1/factors/value/charts/drawdowns?top=3");
        JsonNode json = server.get("/v1/factors/value/drawdowns?top=3").json();
        chart.assertPlotted("underwater", dates(json.path("underwater").path("dates")), numbers(json.path("underwater").path("values"), 0));
        chart.assertTicksOnScale();
        List<Element> markers = chart.withClass("marker");
        assertEquals(3, markers.size());
        for (int i = 0; i < 3; i++) {
            JsonNode e = json.path("episodes").get(i);
            Element m = markers.get(i);
            assertEquals(e.path("trough").asText(), m.getAttribute("data-date"));
            assertEquals(chart.x(LocalDate.parse(e.path("trough").asText())), Double.parseDouble(m.getAttribute("cx")), 0.0051);
            assertEquals(chart.y(e.path("depth").asDouble()), Double.parseDouble(m.getAttribute("cy")), 0.0051);
        }
        assertEquals(3, chart.withClass("band").size());
        assertTrue(chart.withClass("legend-entry").isEmpty(), "one line needs no legend");
        assertEquals(0.0, chart.yMax, 1e-12, "the underwater curve is drawn down from zero");
    }

    @Test
    void significanceDrawsTheRollingNeweyWestTWithReferenceLinesAndTheDiscoveryDate() {
        SvgChart chart = chart("/v1/factors/quality/charts/significance?window=36&threshold=2");
        JsonNode json = server.get("/v1/factors/quality/significance?window=36&threshold=2").json();
        chart.assertPlotted("nw_t_stat", dates(json.path("rolling").path("dates")), numbers(json.path("rolling").path("nw_t_stat"), 0));
        chart.assertTicksOnScale();
        List<Double> rules = chart.withClass("rule").stream().map(e -> Double.parseDouble(e.getAttribute("data-value"))).toList();
        assertEquals(List.of(2.0, -2.0), rules);
        for (Element rule : chart.withClass("rule")) {
            assertEquals(chart.y(Double.parseDouble(rule.getAttribute("data-value"))), Double.parseDouble(rule.getAttribute("y1")), 0.0051);
        }
        // quality declares found_on 2012-11-30 in seed-data/factors.json
        List<Element> marker = chart.withClass("date-marker");
        assertEquals(1, marker.size());
        assertEquals("2012-11-30", marker.get(0).getAttribute("data-date"));
        assertEquals(chart.x(LocalDate.parse("2012-11-30")), Double.parseDouble(marker.get(0).getAttribute("x1")), 0.0051);
    }

    @Test
    void significanceWithoutAWindowUsesFiveYearsOfPeriods() {
        SvgChart chart = chart("/v1/factors/size/charts/significance");
        JsonNode json = server.get("/v1/factors/size/significance?window=60").json();
        chart.assertPlotted("nw_t_stat", dates(json.path("rolling").path("dates")), numbers(json.path("rolling").path("nw_t_stat"), 0));
    }

    @Test
    void correlationHeatmapWritesEveryCoefficientOfTheMatrix() {
        String names = "market,size,value,momentum,noise_alpha";
        SvgChart chart = chart("/v1/charts/correlations?factors=" + names + "&method=spearman&from=2010-01-01");
        JsonNode json = server.get("/v1/correlations?factors=" + names + "&method=spearman&from=2010-01-01").json();
        List<String> list = List.of(names.split(","));
        List<Element> cells = chart.withClass("cell");
        assertEquals(25, cells.size());
        List<Element> texts = chart.withClass("cell-text");
        assertEquals(25, texts.size());
        for (int k = 0; k < 25; k++) {
            Element cell = cells.get(k);
            int i = list.indexOf(cell.getAttribute("data-row"));
            int j = list.indexOf(cell.getAttribute("data-col"));
            double expected = json.path("matrix").get(i).get(j).asDouble();
            assertEquals(expected, Double.parseDouble(cell.getAttribute("data-value")), 0.0);
            // written to two decimals with a true minus sign
            String written = String.format(java.util.Locale.ROOT, "%.2f", expected).replace("-0.00", "0.00").replace('-', '\u2212');
            assertEquals(written, texts.get(k).getTextContent());
        }
        assertTrue(chart.text("title").contains("Spearman"));
    }

    @Test
    void portfoliosChartDrawsEachBucketsMeanWithItsNeweyWestT() {
        SvgChart chart = chart("/v1/factors/value_quintile_cap/charts/portfolios");
        // the monotonicity section summarises the same five quintile portfolios on the monthly basis (the demo is monthly)
        JsonNode buckets = server.get("/v1/factors/value_quintile_cap/evidence").json().path("monotonicity").path("buckets");
        List<Element> bars = chart.withClass("bar");
        assertEquals(5, bars.size());
        double zero = chart.y(0);
        for (int i = 0; i < 5; i++) {
            Element bar = bars.get(i);
            JsonNode b = buckets.get(i);
            assertEquals(String.valueOf(i + 1), bar.getAttribute("data-category"));
            double mean = b.path("mean").asDouble();
            assertEquals(mean, Double.parseDouble(bar.getAttribute("data-value")), 1e-12);
            double top = Double.parseDouble(bar.getAttribute("y"));
            double height = Double.parseDouble(bar.getAttribute("height"));
            assertEquals(Math.min(chart.y(mean), zero), top, 0.0051, "bar " + (i + 1) + " top");
            assertEquals(Math.abs(chart.y(mean) - zero), height, 0.0102, "bar " + (i + 1) + " height");
            String t = String.format(java.util.Locale.ROOT, "t %.2f", b.path("nw_t_stat").asDouble()).replace('-', '\u2212');
            assertEquals(t, chart.withClass("bar-note").get(i).getTextContent());
        }
        assertTrue(chart.withClass("y-tick").size() >= 2);
        for (Element tick : chart.withClass("y-tick")) {
            assertEquals(chart.y(Double.parseDouble(tick.getAttribute("data-value"))) + 4, Double.parseDouble(tick.getAttribute("y")), 0.0051);
        }
    }

    @Test
    void portfoliosChartOfASizeSortMatchesTheMeansOfItsSixSeries() {
        String range = "from=2010-01-01&frequency=quarterly";
        SvgChart chart = chart("/v1/factors/size/charts/portfolios?" + range);
        JsonNode json = server.get("/v1/factors/size/portfolios?" + range).json();
        List<Element> bars = chart.withClass("bar");
        assertEquals(6, bars.size());
        for (int k = 0; k < 6; k++) {
            String name = json.path("portfolios").get(k).asText();
            assertEquals(name, bars.get(k).getAttribute("data-category"));
            // the mean of the defined returns, by Apache Commons Math
            org.apache.commons.math3.stat.descriptive.DescriptiveStatistics stats = new org.apache.commons.math3.stat.descriptive.DescriptiveStatistics();
            json.path("returns").path(name).forEach(r -> {
                if (!r.isNull()) {
                    stats.addValue(r.asDouble());
                }
            });
            assertEquals(stats.getMean(), Double.parseDouble(bars.get(k).getAttribute("data-value")), 1e-12, name);
        }
        TestServer.assertProblem(server.get("/v1/factors/market/charts/portfolios"), 409);
        TestServer.assertProblem(server.get("/v1/factors/size/charts/portfolios?net=true"), 400);
    }

    /** The bars of an IC chart against the {@code summary} of {@code /ic} for the same query, at the chart's scale. */
    static void assertIcBars(String factor, String query) {
        SvgChart chart = chart("/v1/factors/" + factor + "/charts/ic?" + query);
        JsonNode summary = server.get("/v1/factors/" + factor + "/ic?" + query).json().path("summary");
        List<Element> bars = chart.withClass("bar");
        assertEquals(summary.size(), bars.size());
        double zero = chart.y(0);
        for (int i = 0; i < bars.size(); i++) {
            Element bar = bars.get(i);
            JsonNode s = summary.get(i);
            assertEquals(s.path("horizon").asText(), bar.getAttribute("data-category"));
            double mean = s.path("mean").asDouble();
            assertEquals(mean, Double.parseDouble(bar.getAttribute("data-value")), 0.0, "the mean IC as /ic serves it");
            assertEquals(Math.min(chart.y(mean), zero), Double.parseDouble(bar.getAttribute("y")), 0.0051, "bar " + i + " top");
            assertEquals(Math.abs(chart.y(mean) - zero), Double.parseDouble(bar.getAttribute("height")), 0.0102, "bar " + i + " height");
            String t = String.format(java.util.Locale.ROOT, "t %.2f", s.path("nw_t_stat").asDouble()).replace('-', '\u2212');
            assertEquals(t, chart.withClass("bar-note").get(i).getTextContent());
        }
        for (Element tick : chart.withClass("y-tick")) {
            assertEquals(chart.y(Double.parseDouble(tick.getAttribute("data-value"))) + 4, Double.parseDouble(tick.getAttribute("y")), 0.0051);
        }
        assertTrue(chart.text("title").contains(factor), chart.text("title"));
    }

    @Test
    void icChartDrawsTheMeanInformationCoefficientOfEachHorizonWithItsNeweyWestT() {
        assertIcBars("value_quintile_cap", "horizons=1,3,6,12&from=2004-01-01&width=700&height=360");
        assertIcBars("momentum", "horizons=1,2&method=pearson&min_securities=50&to=2020-12-31");
        // investment is low_minus_high on asset growth: the raw signal predicts negatively, so its bars point down
        SvgChart chart = chart("/v1/factors/investment/charts/ic?horizons=1");
        assertTrue(Double.parseDouble(chart.withClass("bar").get(0).getAttribute("data-value")) < 0);
        assertTrue(chart.text("desc").contains("Spearman") && chart.text("desc").contains("h = 1"), chart.text("desc"));
    }

    @Test
    void icChartRejectsWhatTheNumbersDoNotTake() {
        TestServer.assertProblem(server.get("/v1/factors/market/charts/ic"), 409);
        TestServer.assertProblem(server.get("/v1/factors/nope/charts/ic"), 404);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?width=5"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?horizons=0"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?method=kendall"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?net=true"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?frequency=quarterly"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/ic?from=2030-01-01"), 400);
    }

    @Test
    void anUnchangedChartAnswers304AndTheETagFollowsTheData() {
        TestServer.Reply first = server.get("/v1/factors/value/charts/cumulative");
        String tag = first.header("ETag");
        TestServer.Reply again = server.send(server.request("/v1/factors/value/charts/cumulative", TestServer.ADMIN)
                .header("If-None-Match", tag).GET());
        assertEquals(304, again.status());
        TestServer.Reply other = server.get("/v1/charts/correlations?factors=value,size");
        TestServer.Reply otherAgain = server.send(server.request("/v1/charts/correlations?factors=value,size", TestServer.ADMIN)
                .header("If-None-Match", other.header("ETag")).GET());
        assertEquals(304, otherAgain.status());
    }

    @Test
    void badParametersAreProblemsThatSayWhatToFix() {
        TestServer.assertProblem(server.get("/v1/factors/value/charts/cumulative?width=100"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/cumulative?height=99999"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/cumulative?leg=long"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/cumulative?log=maybe"), 400);
        TestServer.assertProblem(server.get("/v1/factors/nope/charts/cumulative"), 404);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/drawdowns?from=2030-01-01"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/significance?window=100000"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/pie"), 404);
        TestServer.assertProblem(server.get("/v1/charts/correlations?factors=value"), 400);
        TestServer.assertProblem(server.get("/v1/factors/value/charts/cumulative", null), 401);
    }

    @Test
    void everyChartFitsItsViewBox() {
        SvgChart chart = chart("/v1/factors/investment/charts/cumulative?width=320&height=200");
        assertEquals("0 0 320 200", chart.root.getAttribute("viewBox"));
        for (double[] p : chart.series("spread")) {
            assertTrue(p[0] >= chart.plotX - 0.01 && p[0] <= chart.plotX + chart.plotW + 0.01, "x inside the plot");
            assertTrue(p[1] >= chart.plotY - 0.01 && p[1] <= chart.plotY + chart.plotH + 0.01, "y inside the plot");
        }
        assertFalse(chart.withClass("x-tick").isEmpty());
    }
}
