package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.correlation.PearsonsCorrelation;
import org.apache.commons.math3.stat.correlation.SpearmansCorrelation;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Analytics over HTTP on the real server: frequency conversion, summary, drawdowns, correlations and rolling
 * significance of external series uploaded as exact numbers. Every expected value is worked by hand in the comments
 * or computed inside the test by Apache Commons Math 3.6.1 (named beside each check); none is copied from Winnow's
 * own output. Every body is checked for NaN and infinities, which must never reach JSON.
 */
class AnalyticsEndToEndTest {
    static TestServer server;

    /** Dates and returns of the generated series "steady" and "wobble" (rolling correlation and significance). */
    static final TreeMap<LocalDate, Double> STEADY = new TreeMap<>();
    static final TreeMap<LocalDate, Double> WOBBLE = new TreeMap<>();

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        external("dd", monthEnds(2021, 1, 9), "-0.10", "0.05", "0.10", "-0.02", "0.05", "-0.20", "0.10", "-0.25", "0.10");
        external("daily", List.of(LocalDate.parse("2020-09-30"), LocalDate.parse("2020-11-27"), LocalDate.parse("2020-11-30"),
                        LocalDate.parse("2020-12-01"), LocalDate.parse("2020-12-04"), LocalDate.parse("2020-12-29"),
                        LocalDate.parse("2020-12-30"), LocalDate.parse("2020-12-31"), LocalDate.parse("2021-01-01"),
                        LocalDate.parse("2021-01-04"), LocalDate.parse("2021-01-05")),
                "0.10", "0.01", "0.02", "-0.01", "0.03", "0.05", "-0.02", "0.01", "0.04", "-0.03", "0.02");
        external("sixer", monthEnds(2019, 1, 6), "0.03", "-0.01", "0.00", "0.05", "-0.02", "0.01");
        external("flat", monthEnds(2018, 1, 5), "0.01", "0.01", "0.01", "0.01", "0.01");
        external("single", monthEnds(2018, 1, 1), "0.02");
        external("xs", monthEnds(2018, 1, 5), "0.01", "0.02", "0.02", "0.03", "0.05");
        external("ys", monthEnds(2018, 1, 5), "0.02", "0.01", "0.03", "0.03", "0.04");
        external("zs", monthEnds(2018, 2, 6), "0.01", "-0.02", "0.04", "0.00", "0.03", "-0.01");
        external("late", monthEnds(2018, 4, 4), "0.03", "-0.01", "0.02", "0.05");
        external("old", monthEnds(2010, 1, 4), "0.01", "0.02", "-0.01", "0.00");

        // 40 month-ends; "steady" has every one, "wobble" misses three of them and has one mid-month date of its own
        Random random = new Random(20240611L);
        List<LocalDate> months = monthEnds(2015, 1, 40);
        for (int i = 0; i < months.size(); i++) {
            STEADY.put(months.get(i), round6(0.012 + 0.03 * random.nextGaussian()));
            if (i != 5 && i != 17 && i != 30) {
                WOBBLE.put(months.get(i), round6(0.5 * STEADY.get(months.get(i)) + 0.02 * random.nextGaussian()));
            }
        }
        WOBBLE.put(LocalDate.parse("2016-07-15"), 0.004);
        external("steady", STEADY);
        external("wobble", WOBBLE);
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    /**
     * Monthly returns -10%, +5%, +10%, -2%, +5%, -20%, +10%, -25%, +10% from January to September 2021. By hand,
     * wealth W (starting at 1), running peak P (the starting 1 included) and underwater W/P - 1:
     * <pre>
     * Jan  W = 0.9                         P = 1         uw = -0.10
     * Feb  W = 0.9 x 1.05 = 0.945          P = 1         uw = -0.055
     * Mar  W = 0.945 x 1.1 = 1.0395        P = 1.0395    uw = 0          (recovered)
     * Apr  W = 1.0395 x 0.98               P = 1.0395    uw = -0.02
     * May  W = 1.0395 x 0.98 x 1.05        new peak (0.98 x 1.05 = 1.029 > 1)  uw = 0
     * Jun  uw = 0.80 - 1                                  = -0.20
     * Jul  uw = 0.80 x 1.10 - 1 = 0.88 - 1                = -0.12
     * Aug  uw = 0.88 x 0.75 - 1 = 0.66 - 1                = -0.34
     * Sep  uw = 0.66 x 1.10 - 1 = 0.726 - 1               = -0.274   (still under water at the end)
     * </pre>
     * Episodes, deepest first: (peak May, trough Aug, recovery null, depth -0.34, duration 4: Jun..Sep);
     * (peak null because the run starts at the first date, trough Jan, recovery Mar, depth -0.10, duration 2);
     * (peak Mar, trough Apr, recovery May, depth -0.02, duration 1). max_drawdown = -0.34.
     */
    @Test
    void drawdownsWorkedByHand() {
        JsonNode body = ok("/v1/factors/dd/drawdowns");
        assertEquals(-0.34, body.path("max_drawdown").asDouble(), 1e-12);
        assertEquals(dateList(monthEnds(2021, 1, 9)), body.path("underwater").path("dates").toString());
        double[] underwater = {-0.10, -0.055, 0, -0.02, 0, -0.20, -0.12, -0.34, -0.274};
        assertArray(underwater, body.path("underwater").path("values"), 1e-12);
        JsonNode episodes = body.path("episodes");
        assertEquals(3, episodes.size(), episodes.toString());
        assertEpisode(episodes.get(0), "2021-05-31", "2021-08-31", null, -0.34, 4);
        assertEpisode(episodes.get(1), null, "2021-01-31", "2021-03-31", -0.10, 2);
        assertEpisode(episodes.get(2), "2021-03-31", "2021-04-30", "2021-05-31", -0.02, 1);

        JsonNode top2 = ok("/v1/factors/dd/drawdowns?top=2").path("episodes");
        assertEquals(2, top2.size());
        assertEquals(episodes.get(0), top2.get(0));
        assertEquals(episodes.get(1), top2.get(1));

        // the summary's max_drawdown is the same hand-worked -0.34
        assertEquals(-0.34, ok("/v1/factors/dd/summary").path("max_drawdown").asDouble(), 1e-12);
        // from/to restrict the dates first: Jun..Sep alone starts a fresh wealth index at 1, trough 0.66 - 1 in August
        JsonNode tail = ok("/v1/factors/dd/drawdowns?from=2021-06-01&to=2021-09-30");
        assertEquals(-0.34, tail.path("max_drawdown").asDouble(), 1e-12);
        assertTrue(tail.path("episodes").get(0).path("peak").isNull(), tail.toString());
    }

    /**
     * Daily returns (11 dates; median spacing 2 days, so the series is daily) across month ends, the ISO 8601 week
     * 53 of 2020 (Monday 2020-12-28 to Sunday 2021-01-03, which holds 2021-01-01) and the turn of the year:
     * <pre>
     * date        r      ISO week   month     quarter
     * 2020-09-30  0.10   2020-W40   Sep       2020-Q3
     * 2020-11-27  0.01   2020-W48   Nov       2020-Q4
     * 2020-11-30  0.02   2020-W49   Nov
     * 2020-12-01 -0.01   2020-W49   Dec
     * 2020-12-04  0.03   2020-W49   Dec
     * 2020-12-29  0.05   2020-W53   Dec
     * 2020-12-30 -0.02   2020-W53   Dec
     * 2020-12-31  0.01   2020-W53   Dec
     * 2021-01-01  0.04   2020-W53   Jan       2021-Q1
     * 2021-01-04 -0.03   2021-W01   Jan
     * 2021-01-05  0.02   2021-W01   Jan
     * </pre>
     * Weekly: W40 0.10 (2020-09-30); W48 0.01 (2020-11-27); W49 1.02 x 0.99 x 1.03 - 1 = 0.040094 (2020-12-04);
     * W53 1.05 x 0.98 x 1.01 x 1.04 - 1 = 0.0808616 (2021-01-01, across the year end); W01 0.97 x 1.02 - 1 = -0.0106.
     * Monthly: Sep 0.10; Nov 1.01 x 1.02 - 1 = 0.0302; Dec 0.99 x 1.03 x 1.05 x 0.98 x 1.01 - 1 = 0.059764013 (2020-12-31);
     * Jan 1.04 x 0.97 x 1.02 - 1 = 0.028976 (2021-01-05).
     * Quarterly: Q3 0.10; Q4 1.0302 x 1.059764013 - 1 = 0.0917688862; Q1 0.028976.
     * Annual: 2020 1.10 x 1.0917688862 - 1 = 0.2009457748 (2020-12-31); 2021 0.028976 (2021-01-05).
     * Cumulative monthly: 0.10, 1.1 x 1.0302 - 1 = 0.13322, 1.13322 x 1.059764013 - 1 = 0.2009457748,
     * 1.2009457748 x 1.028976 - 1 = 0.2357443796 (the product of all eleven (1 + r), as the native cumulative ends).
     */
    @Test
    void frequencyConversionOverHttp() {
        JsonNode nativeSeries = ok("/v1/factors/daily/returns");
        assertEquals("daily", nativeSeries.path("frequency").asText());
        assertEquals(11, nativeSeries.path("returns").size());

        JsonNode weekly = ok("/v1/factors/daily/returns?frequency=weekly");
        assertEquals("weekly", weekly.path("frequency").asText());
        assertEquals("[\"2020-09-30\",\"2020-11-27\",\"2020-12-04\",\"2021-01-01\",\"2021-01-05\"]", weekly.path("dates").toString());
        assertArray(new double[] {0.10, 0.01, 0.040094, 0.0808616, -0.0106}, weekly.path("returns"), 1e-14);

        JsonNode monthly = ok("/v1/factors/daily/returns?frequency=monthly");
        assertEquals("[\"2020-09-30\",\"2020-11-30\",\"2020-12-31\",\"2021-01-05\"]", monthly.path("dates").toString());
        assertArray(new double[] {0.10, 0.0302, 0.059764013, 0.028976}, monthly.path("returns"), 1e-14);

        double q4 = 1.0302 * 1.059764013;
        JsonNode quarterly = ok("/v1/factors/daily/returns?frequency=quarterly");
        assertEquals("[\"2020-09-30\",\"2020-12-31\",\"2021-01-05\"]", quarterly.path("dates").toString());
        assertArray(new double[] {0.10, q4 - 1, 0.028976}, quarterly.path("returns"), 1e-14);
        assertEquals(0.0917688862, q4 - 1, 1e-10);

        JsonNode annual = ok("/v1/factors/daily/returns?frequency=annual");
        assertEquals("[\"2020-12-31\",\"2021-01-05\"]", annual.path("dates").toString());
        assertArray(new double[] {1.10 * q4 - 1, 0.028976}, annual.path("returns"), 1e-14);

        double total = 1.10 * q4 * 1.028976 - 1;
        assertEquals(0.2357443796, total, 1e-10);
        JsonNode cumulativeMonthly = ok("/v1/factors/daily/returns?frequency=monthly&form=cumulative");
        assertEquals("cumulative", cumulativeMonthly.path("form").asText());
        assertArray(new double[] {0.10, 0.13322, 1.10 * q4 - 1, total}, cumulativeMonthly.path("returns"), 1e-14);
        JsonNode cumulativeNative = ok("/v1/factors/daily/returns?form=cumulative");
        // first two native dates: 0.10 and 1.1 x 1.01 - 1 = 0.111; the last is the whole product
        assertEquals(0.10, cumulativeNative.path("returns").get(0).asDouble(), 1e-14);
        assertEquals(0.111, cumulativeNative.path("returns").get(1).asDouble(), 1e-14);
        assertEquals(total, cumulativeNative.path("returns").get(10).asDouble(), 1e-14);

        // CSV carries the same converted numbers
        String[] csv = server.get("/v1/factors/daily/returns?frequency=weekly&format=csv").body().split("\n");
        assertEquals("date,return", csv[0]);
        assertEquals("2021-01-01", csv[4].split(",")[0]);
        assertEquals(0.0808616, Double.parseDouble(csv[4].split(",")[1]), 1e-14);

        // the summary of the monthly conversion annualises with 12 periods: annual_mean = 12 x mean of the 4 months
        JsonNode monthlySummary = ok("/v1/factors/daily/summary?frequency=monthly");
        assertEquals("monthly", monthlySummary.path("frequency").asText());
        assertEquals(4, monthlySummary.path("n").asInt());
        double monthlyMean = (0.10 + 0.0302 + 0.059764013 + 0.028976) / 4;
        assertEquals(monthlyMean, monthlySummary.path("mean").asDouble(), 1e-14);
        assertEquals(12 * monthlyMean, monthlySummary.path("annual_mean").asDouble(), 1e-13);

        // a monthly series cannot be made finer
        problem("/v1/factors/dd/returns?frequency=daily", 400);
        problem("/v1/factors/dd/returns?frequency=weekly", 400);
        problem("/v1/factors/dd/summary?frequency=daily", 400);
        problem("/v1/factors/daily/returns?form=log", 400);
    }

    /**
     * Six monthly returns 3%, -1%, 0%, 5%, -2%, 1% (January to June 2019), worked by hand in units of 0.01:
     * <pre>
     * mean = (3 - 1 + 0 + 5 - 2 + 1) / 6 = 1                        -> 0.01
     * e = r - mean = 2, -2, -1, 4, -3, 0
     * sum e^2 = 4+4+1+16+9+0 = 34;  sum e^3 = 8-8-1+64-27+0 = 36;  sum e^4 = 16+16+1+256+81+0 = 370
     * stdev = sqrt(34/5) -> sqrt(0.0034/5) = sqrt(0.00068) = 0.0260768096
     * t_stat = mean / (stdev/sqrt 6) = sqrt(6 x 0.0001 / 0.00068) = sqrt(6/6.8) = 0.9393364366
     * m2 = 34/6, m3 = 36/6 = 6, m4 = 370/6 (units cancel in the ratios)
     * skewness = m3 / m2^1.5 = 6 (6/34)^1.5 = 6 (3/17)^1.5 = 0.4447948502
     * kurtosis = m4 / m2^2 = (370/6)(36/1156) = 2220/1156 = 555/289 = 1.9204152249
     * hit_rate = #{r > 0} / 6 = 3/6 (the 0% month is not above zero); best 0.05, worst -0.02
     * annual: mean x 12 = 0.12; stdev x sqrt 12 = sqrt(0.00816) = 0.0903327183; sharpe = 0.01/0.0260768096 x sqrt 12 = 1.3284223283
     * Newey-West, L = 1 (weight 1 - 1/2): lag-1 products e_t e_{t-1} = -4, 2, -4, -12, 0 -> sum -18
     *   S = (34 + 2 x 0.5 x (-18)) / 6 = 16/6;  S/n = 16/36;  sqrt = 4/6 (x 0.01)  -> nw_t = 1 / (4/6) = 1.5
     * Newey-West, automatic L = floor(4 (6/100)^(2/9)) = floor(4 x 0.5351) = 2; weights 2/3 and 1/3;
     *   lag-2 products = -2, -8, 3, 0 -> sum -7;  S = (34 - 2(2/3)18 - 2(1/3)7)/6 = (16/3)/6 = 8/9;
     *   S/n = 8/54 = 4/27;  nw_t = 1/sqrt(4/27) = sqrt(27)/2 = 2.5980762114
     * wealth 1.03, 1.0197, 1.0197, 1.070685 (peak), 1.0492713, 1.05976...: max_drawdown = 0.98 - 1 = -0.02
     * </pre>
     */
    @Test
    void summaryWorkedByHand() {
        JsonNode s = ok("/v1/factors/sixer/summary?lags=1");
        assertEquals("monthly", s.path("frequency").asText());
        assertEquals(6, s.path("n").asInt());
        assertEquals(0.01, s.path("mean").asDouble(), 1e-15);
        assertEquals(Math.sqrt(0.00068), s.path("stdev").asDouble(), 1e-15);
        assertEquals(0.0260768096, s.path("stdev").asDouble(), 1e-10);
        assertEquals(Math.sqrt(6 / 6.8), s.path("t_stat").asDouble(), 1e-12);
        assertEquals(6 * Math.pow(3.0 / 17, 1.5), s.path("skewness").asDouble(), 1e-12);
        assertEquals(0.4447948502, s.path("skewness").asDouble(), 1e-10);
        assertEquals(555.0 / 289, s.path("kurtosis").asDouble(), 1e-12);
        assertEquals(0.5, s.path("hit_rate").asDouble(), 0);
        assertEquals(0.05, s.path("best").asDouble(), 0);
        assertEquals(-0.02, s.path("worst").asDouble(), 0);
        assertEquals(0.12, s.path("annual_mean").asDouble(), 1e-14);
        assertEquals(0.0903327183, s.path("annual_volatility").asDouble(), 1e-10);
        assertEquals(1.3284223283, s.path("sharpe_annual").asDouble(), 1e-10);
        assertEquals(1, s.path("nw_lags").asInt());
        assertEquals(1.5, s.path("nw_t_stat").asDouble(), 1e-12);
        // p-value of 1.5: two-sided standard normal tail from Commons Math NormalDistribution (outside library);
        // about 0.1336 from printed normal tables (from memory)
        double p = 2 * new NormalDistribution().cumulativeProbability(-1.5);
        assertEquals(p, s.path("p_value").asDouble(), 1e-12);
        assertEquals(0.1336, s.path("p_value").asDouble(), 1e-4);
        assertEquals(-0.02, s.path("max_drawdown").asDouble(), 1e-14);

        // cross-check of mean and sample standard deviation with Commons Math DescriptiveStatistics
        DescriptiveStatistics reference = new DescriptiveStatistics(new double[] {0.03, -0.01, 0.00, 0.05, -0.02, 0.01});
        assertEquals(reference.getMean(), s.path("mean").asDouble(), 1e-15);
        assertEquals(reference.getStandardDeviation(), s.path("stdev").asDouble(), 1e-15);

        JsonNode auto = ok("/v1/factors/sixer/summary");
        assertEquals(2, auto.path("nw_lags").asInt());
        assertEquals(Math.sqrt(27) / 2, auto.path("nw_t_stat").asDouble(), 1e-12);
        assertEquals(2, ok("/v1/factors/sixer/summary?lags=auto").path("nw_lags").asInt());

        // a constant series: stdev exactly 0, every ratio that divides by it is null, never NaN
        JsonNode flat = ok("/v1/factors/flat/summary");
        assertEquals(5, flat.path("n").asInt());
        assertEquals(0.01, flat.path("mean").asDouble(), 1e-15);
        assertEquals(0.0, flat.path("stdev").asDouble(), 0);
        for (String undefined : List.of("sharpe_annual", "skewness", "kurtosis", "t_stat", "nw_t_stat", "p_value")) {
            assertTrue(flat.path(undefined).isNull(), undefined + " should be null: " + flat);
        }
        assertEquals(1.0, flat.path("hit_rate").asDouble(), 0);
        assertEquals(0.0, flat.path("max_drawdown").asDouble(), 0);

        // a single observation: no dispersion at all
        JsonNode single = ok("/v1/factors/single/summary");
        assertEquals(1, single.path("n").asInt());
        assertEquals(0.02, single.path("mean").asDouble(), 0);
        for (String undefined : List.of("stdev", "annual_volatility", "sharpe_annual", "t_stat", "nw_t_stat", "p_value")) {
            assertTrue(single.path(undefined).isNull(), undefined + " should be null: " + single);
        }
    }

    /**
     * xs = 1, 2, 2, 3, 5 and ys = 2, 1, 3, 3, 4 (in %, January to May 2018), worked by hand:
     * <pre>
     * Pearson: means 2.6 and 2.6; dx = -1.6, -0.6, -0.6, 0.4, 2.4; dy = -0.6, -1.6, 0.4, 0.4, 1.4
     *   sum dx dy = 0.96 + 0.96 - 0.24 + 0.16 + 3.36 = 5.2; sum dx^2 = 9.2; sum dy^2 = 5.2
     *   r = 5.2 / sqrt(9.2 x 5.2) = sqrt(5.2/9.2) = 0.7518094
     * Spearman with ties sharing their mean rank: ranks x = 1, 2.5, 2.5, 4, 5; ranks y = 2, 1, 3.5, 3.5, 5
     *   deviations from 3: -2, -0.5, -0.5, 1, 2 and -1, -2, 0.5, 0.5, 2
     *   sum products = 2 + 1 - 0.25 + 0.5 + 4 = 7.25; sums of squares 9.5 and 9.5 -> rho = 7.25/9.5 = 0.7631579
     * </pre>
     * (A rank-difference shortcut 1 - 6 sum d^2 / (n(n^2-1)) would give 0.775 here; with ties the definition is
     * Pearson on average ranks, as the spec says.) zs covers February to July, so the pairs with zs use their 4 common
     * dates; "late" (April to July) shares only April and May with xs, too few for a correlation (null); "flat" does not
     * vary (null); those are checked against Commons Math PearsonsCorrelation/SpearmansCorrelation on the common dates.
     */
    @Test
    void correlationsTextbookExampleWithTies() {
        JsonNode pearson = ok("/v1/correlations?factors=xs,ys");
        assertEquals("pearson", pearson.path("method").asText());
        assertEquals(Math.sqrt(5.2 / 9.2), pearson.path("matrix").get(0).get(1).asDouble(), 1e-12);
        assertEquals(0.7518094, pearson.path("matrix").get(1).get(0).asDouble(), 1e-7);
        assertEquals(1.0, pearson.path("matrix").get(0).get(0).asDouble(), 1e-15);
        assertEquals("[[5,5],[5,5]]", pearson.path("observations").toString());

        JsonNode spearman = ok("/v1/correlations?factors=xs,ys&method=spearman");
        assertEquals("spearman", spearman.path("method").asText());
        assertEquals(7.25 / 9.5, spearman.path("matrix").get(0).get(1).asDouble(), 1e-12);

        double[] x = {0.01, 0.02, 0.02, 0.03, 0.05};
        double[] y = {0.02, 0.01, 0.03, 0.03, 0.04};
        assertEquals(new PearsonsCorrelation().correlation(x, y), pearson.path("matrix").get(0).get(1).asDouble(), 1e-12);
        assertEquals(new SpearmansCorrelation().correlation(x, y), spearman.path("matrix").get(0).get(1).asDouble(), 1e-12);

        // pairwise complete: xs (Jan-May), ys (Jan-May), zs (Feb-Jul), late (Apr-Jul), flat (Jan-May)
        for (String method : List.of("pearson", "spearman")) {
            JsonNode m = ok("/v1/correlations?factors=xs,ys,zs,late,flat&method=" + method);
            assertEquals("[\"xs\",\"ys\",\"zs\",\"late\",\"flat\"]", m.path("factors").toString());
            assertEquals("[[5,5,4,2,5],[5,5,4,2,5],[4,4,6,4,4],[2,2,4,4,2],[5,5,4,2,5]]", m.path("observations").toString());
            // xs and zs on Feb..May: xs 2, 2, 3, 5 and zs 1, -2, 4, 0 (%)
            double[] xsCommon = {0.02, 0.02, 0.03, 0.05};
            double[] zsCommon = {0.01, -0.02, 0.04, 0.00};
            double[] lateCommon = {0.03, -0.01, 0.02, 0.05};
            double[] zsWithLate = {0.04, 0.00, 0.03, -0.01};
            boolean p = method.equals("pearson");
            assertEquals(p ? new PearsonsCorrelation().correlation(xsCommon, zsCommon) : new SpearmansCorrelation().correlation(xsCommon, zsCommon),
                    m.path("matrix").get(0).get(2).asDouble(), 1e-12, method);
            assertEquals(m.path("matrix").get(0).get(2), m.path("matrix").get(2).get(0));
            assertEquals(p ? new PearsonsCorrelation().correlation(zsWithLate, lateCommon) : new SpearmansCorrelation().correlation(zsWithLate, lateCommon),
                    m.path("matrix").get(2).get(3).asDouble(), 1e-12, method);
            assertTrue(m.path("matrix").get(0).get(3).isNull(), "two common dates give no correlation: " + m);
            for (int i = 0; i < 5; i++) {
                assertTrue(m.path("matrix").get(4).get(i).isNull(), "a constant series correlates with nothing: " + m);
                assertTrue(m.path("matrix").get(i).get(4).isNull(), "a constant series correlates with nothing: " + m);
            }
        }

        // from/to restrict before pairing: Feb..May leaves xs and ys four common dates
        JsonNode ranged = ok("/v1/correlations?factors=xs,ys&from=2018-02-01&to=2018-05-31");
        assertEquals("[[4,4],[4,4]]", ranged.path("observations").toString());
        assertEquals(new PearsonsCorrelation().correlation(new double[] {0.02, 0.02, 0.03, 0.05}, new double[] {0.01, 0.03, 0.03, 0.04}),
                ranged.path("matrix").get(0).get(1).asDouble(), 1e-12);
    }

    /** Rolling correlation on the common dates against Commons Math on each window of 12 common observations. */
    @Test
    void rollingCorrelationAgainstCommonsMath() {
        List<LocalDate> common = new ArrayList<>();
        for (LocalDate d : STEADY.keySet()) {
            if (WOBBLE.containsKey(d)) {
                common.add(d);
            }
        }
        assertEquals(37, common.size());
        int window = 12;
        for (String method : List.of("pearson", "spearman")) {
            JsonNode r = ok("/v1/correlations/rolling?factors=steady,wobble&window=" + window + "&method=" + method);
            assertEquals(window, r.path("window").asInt());
            assertEquals(dateList(common.subList(window - 1, common.size())), r.path("dates").toString());
            JsonNode values = r.path("values");
            assertEquals(common.size() - window + 1, values.size());
            for (int end = window - 1; end < common.size(); end++) {
                double[] x = new double[window];
                double[] y = new double[window];
                for (int k = 0; k < window; k++) {
                    LocalDate d = common.get(end - window + 1 + k);
                    x[k] = STEADY.get(d);
                    y[k] = WOBBLE.get(d);
                }
                double expected = method.equals("pearson") ? new PearsonsCorrelation().correlation(x, y)
                        : new SpearmansCorrelation().correlation(x, y);
                assertEquals(expected, values.get(end - window + 1).asDouble(), 1e-10, method + " window ending " + common.get(end));
            }
        }
        // the full-sample pair in the matrix uses the same 37 common dates; wobble has 37 + its own mid-month date
        JsonNode m = ok("/v1/correlations?factors=steady,wobble");
        assertEquals("[[40,37],[37,38]]", m.path("observations").toString());
    }

    /**
     * Rolling significance must equal the summary of each window: for a few windows, /summary?from=&to= over exactly
     * those 12 observations gives the same mean, t, Newey-West t, p-value and Sharpe ratio (one definition, two
     * routes; the summary itself is checked by hand above). With lags=auto both use L = floor(4 (12/100)^(2/9)) =
     * floor(2.497) = 2. share_above is the share of windows whose Newey-West t exceeds the threshold.
     */
    @Test
    void rollingSignificanceEqualsTheSummaryOfEachWindow() {
        List<LocalDate> dates = new ArrayList<>(STEADY.keySet());
        int window = 12;
        for (String lags : List.of("1", "auto")) {
            JsonNode body = ok("/v1/factors/steady/significance?window=" + window + "&lags=" + lags + "&threshold=1.5");
            JsonNode rolling = body.path("rolling");
            assertEquals(window, rolling.path("window").asInt());
            assertEquals(lags.equals("auto") ? 2 : 1, rolling.path("lags").asInt());
            assertEquals(dateList(dates.subList(window - 1, dates.size())), rolling.path("dates").toString());
            int count = dates.size() - window + 1;

            JsonNode whole = ok("/v1/factors/steady/summary?lags=" + lags);
            for (String field : List.of("n", "mean", "stdev", "t_stat", "nw_t_stat", "nw_lags", "p_value", "sharpe_annual",
                    "skewness", "kurtosis", "max_drawdown")) {
                assertEquals(whole.path(field), body.path("summary").path(field), field);
            }

            for (int end : new int[] {window - 1, 20, dates.size() - 1}) {
                JsonNode s = ok("/v1/factors/steady/summary?lags=" + lags + "&from=" + dates.get(end - window + 1) + "&to=" + dates.get(end));
                assertEquals(window, s.path("n").asInt());
                int k = end - window + 1;
                String where = "window ending " + dates.get(end) + ", lags " + lags;
                assertEquals(s.path("mean").asDouble(), rolling.path("mean").get(k).asDouble(), 1e-15, where);
                assertEquals(s.path("t_stat").asDouble(), rolling.path("t_stat").get(k).asDouble(), 1e-12, where);
                assertEquals(s.path("nw_t_stat").asDouble(), rolling.path("nw_t_stat").get(k).asDouble(), 1e-12, where);
                assertEquals(s.path("p_value").asDouble(), rolling.path("p_value").get(k).asDouble(), 1e-12, where);
                assertEquals(s.path("sharpe_annual").asDouble(), rolling.path("sharpe_annual").get(k).asDouble(), 1e-12, where);
                // the window's mean is also plain arithmetic on the uploaded numbers (Commons Math DescriptiveStatistics)
                DescriptiveStatistics reference = new DescriptiveStatistics();
                dates.subList(k, end + 1).forEach(d -> reference.addValue(STEADY.get(d)));
                assertEquals(reference.getMean(), rolling.path("mean").get(k).asDouble(), 1e-15, where);
                assertEquals(reference.getMean() / (reference.getStandardDeviation() / Math.sqrt(window)),
                        rolling.path("t_stat").get(k).asDouble(), 1e-12, where);
            }

            int above = 0;
            for (JsonNode t : rolling.path("nw_t_stat")) {
                above += t.asDouble() > 1.5 ? 1 : 0;
            }
            assertTrue(above > 0 && above < count, "the threshold should split the windows: " + above + " of " + count);
            assertEquals(1.5, rolling.path("threshold").asDouble(), 0);
            assertEquals((double) above / count, rolling.path("share_above").asDouble(), 1e-15);
        }
        JsonNode defaultThreshold = ok("/v1/factors/steady/significance?window=" + window).path("rolling");
        assertEquals(2.0, defaultThreshold.path("threshold").asDouble(), 0);
        int aboveTwo = 0;
        for (JsonNode t : defaultThreshold.path("nw_t_stat")) {
            aboveTwo += t.asDouble() > 2.0 ? 1 : 0;
        }
        assertEquals((double) aboveTwo / defaultThreshold.path("nw_t_stat").size(), defaultThreshold.path("share_above").asDouble(), 1e-15);

        // a window as long as the data gives one window, equal to the full-sample summary
        JsonNode full = ok("/v1/factors/steady/significance?window=40&lags=1").path("rolling");
        assertEquals(1, full.path("dates").size());
        assertEquals(ok("/v1/factors/steady/summary?lags=1").path("nw_t_stat").asDouble(), full.path("nw_t_stat").get(0).asDouble(), 1e-12);
    }

    /** Bad requests are 400 (404 for an unknown factor in the path) problem+json, never a 500, never NaN. */
    @Test
    void badRequestsAreProblems() {
        // unknown factor, too few factors, a factor twice, an unknown method
        problem("/v1/correlations?factors=xs,ghost", 400);
        problem("/v1/correlations?factors=xs", 400);
        problem("/v1/correlations?factors=", 400);
        problem("/v1/correlations", 400);
        problem("/v1/correlations?factors=xs,xs", 400);
        problem("/v1/correlations?factors=xs,ys&method=kendall", 400);
        problem("/v1/correlations/rolling?factors=xs,ghost&window=3", 400);
        problem("/v1/correlations/rolling?factors=xs&window=3", 400);
        problem("/v1/correlations/rolling?factors=xs,ys,zs&window=3", 400);
        // a factor named in the path that does not exist is a 404 on every endpoint (issue 15)
        problem("/v1/factors/ghost/summary", 404);
        problem("/v1/factors/ghost/drawdowns", 404);
        problem("/v1/factors/ghost/significance?window=3", 404);

        // empty overlap: "old" (2010) shares no date with xs (2018); a range with no observations
        problem("/v1/correlations?factors=xs,old", 400);
        problem("/v1/correlations?factors=xs,ys,old", 400);
        problem("/v1/correlations/rolling?factors=xs,old&window=3", 400);
        problem("/v1/correlations?factors=xs,ys&from=2030-01-01", 400);
        problem("/v1/factors/sixer/summary?from=2030-01-01", 400);
        problem("/v1/factors/sixer/drawdowns?to=2000-01-01", 400);
        problem("/v1/factors/sixer/significance?window=3&from=2030-01-01", 400);

        // windows larger than the data, or missing, or too small
        problem("/v1/factors/sixer/significance?window=7", 400);
        problem("/v1/factors/sixer/significance", 400);
        problem("/v1/factors/sixer/significance?window=1", 400);
        problem("/v1/correlations/rolling?factors=xs,ys&window=6", 400);
        problem("/v1/correlations/rolling?factors=xs,zs&window=5", 400);
        problem("/v1/correlations/rolling?factors=xs,ys", 400);

        // bad dates and ranges
        for (String endpoint : List.of("/v1/factors/sixer/summary?", "/v1/factors/sixer/drawdowns?", "/v1/factors/sixer/significance?window=3&",
                "/v1/correlations?factors=xs,ys&", "/v1/factors/sixer/returns?")) {
            problem(endpoint + "from=2020-02-30", 400);
            problem(endpoint + "to=yesterday", 400);
            problem(endpoint + "from=2020-03-01&to=2020-01-01", 400);
            problem(endpoint + "frequency=hourly", 400);
        }

        // Newey-West lags and other numbers
        problem("/v1/factors/sixer/summary?lags=-1", 400);
        problem("/v1/factors/sixer/summary?lags=one", 400);
        problem("/v1/factors/sixer/significance?window=3&lags=-1", 400);
        problem("/v1/factors/sixer/significance?window=3&threshold=high", 400);
        problem("/v1/factors/sixer/significance?window=3&threshold=NaN", 400);
        problem("/v1/factors/sixer/drawdowns?top=0", 400);
        problem("/v1/factors/sixer/drawdowns?top=x", 400);

        // windows where nothing varies answer with nulls, not NaN
        JsonNode flat = ok("/v1/factors/flat/significance?window=3");
        assertTrue(flat.path("rolling").path("t_stat").get(0).isNull(), flat.toString());
        assertEquals(0.0, flat.path("rolling").path("share_above").asDouble(), 0);
        ok("/v1/factors/flat/drawdowns");
        ok("/v1/correlations/rolling?factors=flat,xs&window=3");
        problem("/v1/factors/sixer/significance?window=2", 400);
        problem("/v1/correlations/rolling?factors=xs,ys&window=2", 400);
    }

    // ---------------------------------------------------------------------------------------------------------------

    static JsonNode ok(String path) {
        return FiniteJson.ok(server, path);
    }

    static void problem(String path, int status) {
        FiniteJson.problem(server.get(path), status, path);
    }

    static void assertArray(double[] expected, JsonNode actual, double tolerance) {
        assertEquals(expected.length, actual.size(), actual.toString());
        for (int i = 0; i < expected.length; i++) {
            assertTrue(actual.get(i).isNumber(), "value " + i + " of " + actual);
            assertEquals(expected[i], actual.get(i).asDouble(), tolerance, "value " + i + " of " + actual);
        }
    }

    static void assertEpisode(JsonNode e, String peak, String trough, String recovery, double depth, int duration) {
        assertEquals(peak == null ? "null" : "\"" + peak + "\"", e.path("peak").toString(), e.toString());
        assertEquals(trough, e.path("trough").asText(), e.toString());
        assertEquals(recovery == null ? "null" : "\"" + recovery + "\"", e.path("recovery").toString(), e.toString());
        assertEquals(depth, e.path("depth").asDouble(), 1e-12, e.toString());
        assertEquals(duration, e.path("duration").asInt(), e.toString());
    }

    static List<LocalDate> monthEnds(int year, int month, int count) {
        List<LocalDate> out = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            out.add(YearMonth.of(year, month).plusMonths(i).atEndOfMonth());
        }
        return out;
    }

    static String dateList(List<LocalDate> dates) {
        StringBuilder out = new StringBuilder("[");
        for (int i = 0; i < dates.size(); i++) {
            out.append(i == 0 ? "" : ",").append('"').append(dates.get(i)).append('"');
        }
        return out.append(']').toString();
    }

    static double round6(double v) {
        return Double.parseDouble(String.format(Locale.ROOT, "%.6f", v));
    }

    static void external(String name, List<LocalDate> dates, String... returns) {
        TreeMap<LocalDate, Double> series = new TreeMap<>();
        for (int i = 0; i < dates.size(); i++) {
            series.put(dates.get(i), Double.parseDouble(returns[i]));
        }
        external(name, series);
    }

    static void external(String name, Map<LocalDate, Double> series) {
        external(server, name, series);
    }

    /** Defines an external factor on {@code server} and uploads exactly these returns to it. */
    static void external(TestServer server, String name, Map<LocalDate, Double> series) {
        TestServer.Reply put = server.putJson("/v1/factors/" + name,
                "{\"method\":\"external\",\"theme\":\"test\",\"rationale\":\"hand-made series\"}", ADMIN);
        assertEquals(201, put.status(), put.body());
        StringBuilder csv = new StringBuilder("date,return\n");
        series.forEach((d, r) -> csv.append(d).append(',').append(r).append('\n'));
        JsonNode job = server.upload("/v1/factors/" + name + "/uploads", csv.toString());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }
}
