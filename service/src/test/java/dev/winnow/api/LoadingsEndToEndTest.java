package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.http.HttpRequest;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Security loadings through the whole pipeline on the real server: a generated monthly panel of 30 fictional
 * securities over 80 month-ends (seeded), whose returns are built from planted alphas and betas on two external factor
 * series plus normal noise, with some returns missing. The regression answers are checked against Apache Commons Math
 * 3.6.1 OLSMultipleLinearRegression run here on the same window (an outside implementation), and the planted betas
 * must come back within 4 of its standard errors (a simulation check). Stored answers must equal computed ones.
 */
class LoadingsEndToEndTest {
    static final String PANEL = "harbour";
    static final int SECURITIES = 30;
    static final int MONTHS = 80;
    static final int WINDOW = 60;
    static final int MIN_OBS = WINDOW / 2;
    /** The late lister: rows only from this month index on, so too few observations at the last date. */
    static final int LATE = SECURITIES - 1;
    static final int LATE_FROM = 60;
    /** Factor b has no return at this month index: every security loses that date (exact-date join). */
    static final int B_GAP = 50;
    /** The security with the planted leverage outlier at the last date, and the one without a size score there. */
    static final int OUTLIER = 6;
    static final int NO_SIZE = 4;

    static TestServer server;
    /** 81 month-ends: 80 uploaded at first, the 81st appended by the stored-loadings test. */
    static final List<LocalDate> GRID = new ArrayList<>();
    static final double[] FA = new double[MONTHS + 1];
    static final double[] FB = new double[MONTHS + 1];
    /** Returns [security][month]; NaN where missing (a row with an empty return, or no row at all). */
    static final double[][] RETURNS = new double[SECURITIES][MONTHS + 1];
    static final boolean[][] HAS_ROW = new boolean[SECURITIES][MONTHS + 1];
    static final double[] ALPHA = new double[SECURITIES];
    static final double[] BETA_A = new double[SECURITIES];
    static final double[] BETA_B = new double[SECURITIES];
    static final double[] SIZE_AT_LAST = new double[SECURITIES];
    static String panelCsv;
    static String appendCsv;

    @BeforeAll
    static void start() throws IOException {
        generate(new Random(6061L));
        server = new TestServer();
        external("a", 0, MONTHS);
        external("b", 0, MONTHS);
        JsonNode job = server.upload("/v1/panels/" + PANEL + "/uploads", panelCsv);
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        JsonNode panel = server.get("/v1/panels/" + PANEL).json();
        assertEquals("monthly", panel.path("frequency").asText());
        assertEquals(MONTHS, panel.path("dates").asInt());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    static LocalDate last() {
        return GRID.get(MONTHS - 1);
    }

    @Test
    void regressionLoadingsMatchCommonsMathAndRecoverPlantedBetas() {
        String query = "/v1/loadings?panel=" + PANEL + "&factors=a,b&window=" + WINDOW + "&date=" + last();
        JsonNode body = ok(query);
        assertEquals(PANEL, body.path("panel").asText());
        assertEquals(last().toString(), body.path("date").asText());
        assertEquals("[\"a\",\"b\"]", body.path("factors").toString());
        assertEquals(WINDOW, body.path("window").asInt());
        assertEquals(MIN_OBS, body.path("min_obs").asInt());
        checkAgainstOls(body, MONTHS - 1);

        // defaults for a monthly panel: window 60 and min_obs 30, so the same answer
        assertEquals(body, ok("/v1/loadings?panel=" + PANEL + "&factors=a,b&date=" + last()));
        // the as-of date defaults to the panel's last date (before the append test adds one)
        if (server.get("/v1/panels/" + PANEL).json().path("dates").asInt() == MONTHS) {
            assertEquals(body, ok("/v1/loadings?panel=" + PANEL + "&factors=a,b"));
        }

        // CSV: the same numbers, column order security,n,alpha,beta_a,beta_b,r_squared,residual_vol, empty cells for null
        TestServer.Reply csv = server.send(server.request(query, ADMIN).header("Accept", "text/csv").GET());
        assertEquals(200, csv.status(), csv.body());
        assertTrue(csv.header("Content-Type").startsWith("text/csv"), csv.header("Content-Type"));
        String[] lines = csv.body().split("\n");
        assertEquals("security,n,alpha,beta_a,beta_b,r_squared,residual_vol", lines[0]);
        assertEquals(SECURITIES + 1, lines.length);
        JsonNode securities = body.path("securities");
        for (int i = 0; i < SECURITIES; i++) {
            String[] cells = lines[i + 1].split(",", -1);
            assertEquals(7, cells.length, lines[i + 1]);
            JsonNode row = securities.get(i);
            assertEquals(row.path("security").asText(), cells[0]);
            assertEquals(row.path("n").asInt(), Integer.parseInt(cells[1]));
            JsonNode[] numbers = {row.path("alpha"), row.path("betas").get(0), row.path("betas").get(1), row.path("r_squared"),
                    row.path("residual_vol")};
            for (int c = 0; c < numbers.length; c++) {
                if (numbers[c].isNull()) {
                    assertEquals("", cells[c + 2], lines[i + 1]);
                } else {
                    assertEquals(numbers[c].asDouble(), Double.parseDouble(cells[c + 2]), 0, lines[i + 1]);
                }
            }
        }
        assertEquals(csv.body(), server.get(query + "&format=csv").body());
        // an Accept that also names application/json gets JSON (openapi.yaml, CSV section)
        TestServer.Reply both = server.send(server.request(query, ADMIN).header("Accept", "text/csv, application/json").GET());
        assertEquals(body, both.json());

        // one security's history at the same date is the same row of the table
        JsonNode history = ok("/v1/loadings/" + code(0) + "?panel=" + PANEL + "&factors=a,b&window=" + WINDOW + "&from=" + last() + "&to=" + last());
        JsonNode row0 = securities.get(0);
        assertEquals("[\"" + last() + "\"]", history.path("dates").toString());
        assertEquals(row0.path("n").asInt(), history.path("n").get(0).asInt());
        assertEquals(row0.path("alpha").asDouble(), history.path("alpha").get(0).asDouble(), 0);
        assertEquals(row0.path("betas").get(0).asDouble(), history.path("betas").get(0).get(0).asDouble(), 0);
        assertEquals(row0.path("betas").get(1).asDouble(), history.path("betas").get(1).get(0).asDouble(), 0);
        assertEquals(row0.path("r_squared").asDouble(), history.path("r_squared").get(0).asDouble(), 0);
        // the late lister's history starts with its first row
        JsonNode lateHistory = ok("/v1/loadings/" + code(LATE) + "?panel=" + PANEL + "&factors=a,b&window=" + WINDOW + "&to=" + last());
        assertEquals(GRID.get(LATE_FROM).toString(), lateHistory.path("dates").get(0).asText());
        assertEquals(MONTHS - LATE_FROM, lateHistory.path("dates").size());
        assertTrue(lateHistory.path("alpha").get(MONTHS - LATE_FROM - 1).isNull(), lateHistory.toString());
    }

    /**
     * For each security at grid index {@code asOf}: n = the dates of the last 60 grid dates with its return and both
     * factor returns; with n >= 30, the loadings equal Commons Math OLSMultipleLinearRegression (intercept, the same
     * rows) to 1e-9, and the planted alpha and betas lie within 4 of its standard errors; below 30, null loadings and a
     * reason.
     */
    static void checkAgainstOls(JsonNode body, int asOf) {
        JsonNode securities = body.path("securities");
        List<String> expectedCodes = new ArrayList<>();
        for (int s = 0; s < SECURITIES; s++) {
            if (HAS_ROW[s][asOf]) {
                expectedCodes.add(code(s));
            }
        }
        List<String> codes = new ArrayList<>();
        securities.forEach(row -> codes.add(row.path("security").asText()));
        assertEquals(expectedCodes, codes, "every security with a row at the date, in code order");
        int withLoadings = 0;
        for (JsonNode row : securities) {
            int s = Integer.parseInt(row.path("security").asText().substring(1)) - 1;
            List<Integer> usable = new ArrayList<>();
            for (int t = asOf - WINDOW + 1; t <= asOf; t++) {
                if (!Double.isNaN(RETURNS[s][t]) && !Double.isNaN(FA[t]) && !Double.isNaN(FB[t])) {
                    usable.add(t);
                }
            }
            String who = row.path("security").asText() + " at " + GRID.get(asOf);
            assertEquals(usable.size(), row.path("n").asInt(), who);
            if (usable.size() < MIN_OBS) {
                assertEquals(LATE, s, who + " should have loadings");
                for (String field : List.of("alpha", "r_squared", "residual_vol")) {
                    assertTrue(row.path(field).isNull(), who + " " + field + ": " + row);
                }
                assertEquals("[null,null]", row.path("betas").toString(), who);
                assertTrue(row.path("reason").asText().contains("min_obs"), who + ": " + row);
                continue;
            }
            withLoadings++;
            double[] y = new double[usable.size()];
            double[][] x = new double[usable.size()][];
            for (int k = 0; k < y.length; k++) {
                int t = usable.get(k);
                y[k] = RETURNS[s][t];
                x[k] = new double[] {FA[t], FB[t]};
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.newSampleData(y, x);
            double[] coefficients = ols.estimateRegressionParameters();
            double[] standardErrors = ols.estimateRegressionParametersStandardErrors();
            double[] got = {row.path("alpha").asDouble(), row.path("betas").get(0).asDouble(), row.path("betas").get(1).asDouble()};
            double[] planted = {ALPHA[s], BETA_A[s], BETA_B[s]};
            for (int j = 0; j < 3; j++) {
                assertEquals(coefficients[j], got[j], 1e-9, who + " coefficient " + j);
                assertTrue(Math.abs(got[j] - planted[j]) < 4 * standardErrors[j],
                        who + " coefficient " + j + ": planted " + planted[j] + ", estimated " + got[j] + " +- " + standardErrors[j]);
            }
            assertEquals(ols.calculateRSquared(), row.path("r_squared").asDouble(), 1e-9, who);
            // Commons Math's regression standard error is sqrt(SSR / (n - p)) with p = 3 parameters: n - k - 1
            assertEquals(ols.estimateRegressionStandardError(), row.path("residual_vol").asDouble(), 1e-10, who);
            assertTrue(row.path("reason").isNull(), who);
        }
        assertEquals(expectedCodes.size() - (HAS_ROW[LATE][asOf] ? 1 : 0), withLoadings);
    }

    /**
     * Config, history job, then an appended month: the upload job reports the loadings it refreshed and the new date
     * is answered from the store. Sound comparison with a computed answer: re-putting the config with another window
     * and then the original one deletes the stored rows (a config change drops them), so the same request must be
     * computed on the fly, from the same inputs, and give the same bytes.
     */
    @Test
    void storedLoadingsEqualComputedOnesAfterAnAppend() {
        String config = "{\"factors\":[\"a\",\"b\"],\"window\":" + WINDOW + "}";
        TestServer.Reply put = server.putJson("/v1/panels/" + PANEL + "/loadings-config", config, ADMIN);
        assertEquals(200, put.status(), put.body());
        assertEquals(MIN_OBS, put.json().path("min_obs").asInt());
        assertEquals("[\"a\",\"b\"]", server.get("/v1/panels/" + PANEL + "/loadings-config").json().path("factors").toString());

        String oldDate = "/v1/loadings?panel=" + PANEL + "&date=" + GRID.get(70);
        TestServer.Reply before = server.get(oldDate);
        assertEquals("computed", before.header("Winnow-Loadings-Source"));

        TestServer.Reply history = server.send(server.request("/v1/panels/" + PANEL + "/loadings-config/history", ADMIN)
                .POST(HttpRequest.BodyPublishers.noBody()));
        assertEquals(202, history.status(), history.body());
        JsonNode job = server.awaitJob(history.json().path("job").asText());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        assertEquals(MONTHS, job.path("report").path("computed_dates").asInt(), job.toString());

        TestServer.Reply stored = server.get(oldDate);
        assertEquals("stored", stored.header("Winnow-Loadings-Source"));
        assertEquals(before.body(), stored.body());
        // an explicit request with the configured settings is the same request
        TestServer.Reply explicit = server.get(oldDate + "&factors=a,b&window=" + WINDOW + "&min_obs=" + MIN_OBS);
        assertEquals("stored", explicit.header("Winnow-Loadings-Source"));
        assertEquals(before.body(), explicit.body());

        // a new month: factor returns first, then the panel rows
        external("a", MONTHS, MONTHS + 1);
        external("b", MONTHS, MONTHS + 1);
        JsonNode append = server.upload("/v1/panels/" + PANEL + "/uploads", appendCsv);
        assertEquals("succeeded", append.path("state").asText(), append.toString());
        JsonNode report = append.path("report").path("loadings");
        assertEquals("refreshed", report.path("loadings").asText(), append.toString());
        assertEquals(1, report.path("computed_dates").asInt(), report.toString());
        assertEquals(GRID.get(MONTHS).toString(), report.path("last_computed").asText(), report.toString());

        String newDate = "/v1/loadings?panel=" + PANEL + "&date=" + GRID.get(MONTHS);
        TestServer.Reply fromStore = server.get(newDate);
        assertEquals(200, fromStore.status(), fromStore.body());
        assertEquals("stored", fromStore.header("Winnow-Loadings-Source"));
        assertEquals(fromStore.body(), server.get("/v1/loadings?panel=" + PANEL).body(), "the last date is the default");
        checkAgainstOls(fromStore.json(), MONTHS);
        // earlier dates stay served from the store (their windows did not change)
        assertEquals("stored", server.get(oldDate).header("Winnow-Loadings-Source"));
        assertEquals(before.body(), server.get(oldDate).body());

        assertEquals(200, server.putJson("/v1/panels/" + PANEL + "/loadings-config", config.replace("" + WINDOW, "" + (WINDOW - 1)), ADMIN).status());
        assertEquals(200, server.putJson("/v1/panels/" + PANEL + "/loadings-config", config, ADMIN).status());
        TestServer.Reply computed = server.get(newDate);
        assertEquals("computed", computed.header("Winnow-Loadings-Source"));
        assertEquals(fromStore.body(), computed.body());
        TestServer.Reply computedCsv = server.get(newDate + "&format=csv");
        assertTrue(computedCsv.body().startsWith("security,n,alpha,beta_a,beta_b,r_squared,residual_vol\n"), computedCsv.body());
    }

    /**
     * Characteristic z-scores at the 80th month-end. size_score is uniform on [0, 1) with one security missing: no value
     * lies beyond 3 standard deviations (a uniform sample stays within about sqrt 3 of its mean), so the scores are
     * plain (x - mean) / sd over the 29 present values, checked with Commons Math DescriptiveStatistics; mean 0 and
     * sd 1 across securities. leverage holds -14..14 for 29 securities and 1000 for one, worked by hand:
     * <pre>
     * n = 30, sum = 1000, sum x^2 = 2 (1^2 + ... + 14^2) + 1000^2 = 2 x 1015 + 1,000,000 = 1,002,030
     * m = 1000/30 = 33.3333;  s^2 = (1,002,030 - 1000^2/30) / 29 = 968,696.667 / 29 = 33,403.333;  s = 182.7658
     * upper limit m + 3 s = 33.3333 + 548.2974 = 581.6307 < 1000, so 1000 is clipped to c = 581.6307 (none below m - 3s)
     * clipped: sum = c, sum x^2 = 2030 + c^2;  m' = c/30 = 19.3877;  s'^2 = (2030 + c^2 - c^2/30) / 29 = 11,346.476;  s' = 106.5198
     * z(outlier) = (c - m') / s' = 5.2783;  z(14) = (14 - m') / s' = -0.0506;  z(-14) = -0.3134
     * </pre>
     * Without winsorising, z(14) would be (14 - 33.3333)/182.7658 = -0.1058: the check tells the two apart.
     */
    @Test
    void characteristicZScores() {
        JsonNode body = ok("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=size_score,leverage&date=" + last());
        assertEquals("characteristic", body.path("kind").asText());
        assertEquals("[\"size_score\",\"leverage\"]", body.path("columns").toString());
        JsonNode securities = body.path("securities");
        List<Integer> present = new ArrayList<>();
        for (int s = 0; s < SECURITIES; s++) {
            if (HAS_ROW[s][MONTHS - 1]) {
                present.add(s);
            }
        }
        assertEquals(present.size(), securities.size());

        DescriptiveStatistics sizes = new DescriptiveStatistics();
        for (int s : present) {
            if (s != NO_SIZE) {
                sizes.addValue(SIZE_AT_LAST[s]);
            }
        }
        DescriptiveStatistics scores = new DescriptiveStatistics();
        for (int i = 0; i < present.size(); i++) {
            int s = present.get(i);
            JsonNode row = securities.get(i);
            assertEquals(code(s), row.path("security").asText());
            JsonNode z = row.path("exposures").get(0);
            if (s == NO_SIZE) {
                assertTrue(z.isNull(), "a missing value stays null: " + row);
                continue;
            }
            assertEquals((SIZE_AT_LAST[s] - sizes.getMean()) / sizes.getStandardDeviation(), z.asDouble(), 1e-12, code(s));
            scores.addValue(z.asDouble());
        }
        assertEquals(29, scores.getN());
        assertEquals(0.0, scores.getMean(), 1e-12);
        assertEquals(1.0, scores.getStandardDeviation(), 1e-12);

        double c = 1000.0 / 30 + 3 * Math.sqrt((1_002_030 - 1_000_000.0 / 30) / 29);
        assertEquals(581.6307, c, 1e-4);
        double mean = c / 30;
        double sd = Math.sqrt((2030 + c * c - c * c / 30) / 29);
        assertEquals(106.5198, sd, 1e-4);
        assertEquals(SECURITIES, present.size(), "every security has a row at the last date");
        for (int i = 0; i < present.size(); i++) {
            int s = present.get(i);
            double z = securities.get(i).path("exposures").get(1).asDouble();
            double value = s == OUTLIER ? c : leverageAtLast(s);
            assertEquals((value - mean) / sd, z, 1e-12, code(s));
        }
        assertEquals(5.2783, securities.get(OUTLIER).path("exposures").get(1).asDouble(), 1e-4);
        assertEquals(-0.0506, securities.get(indexOfLeverage(14)).path("exposures").get(1).asDouble(), 1e-4);
        assertEquals(-0.3134, securities.get(indexOfLeverage(-14)).path("exposures").get(1).asDouble(), 1e-4);

        String csv = server.get("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=leverage&date=" + last() + "&format=csv").body();
        assertTrue(csv.startsWith("security,leverage\n" + code(0) + ","), csv);
    }

    /**
     * Exposures = weight-sum of the betas that GET /v1/loadings gives for the same panel, date and factors:
     * holdings 0.5 of S0001, -0.2 of S0002, 0.1 of the late lister (too few observations) and 0.2 of a security the
     * panel does not have. exposure_j = 0.5 beta_1j - 0.2 beta_2j; coverage = (0.5 + 0.2) / (0.5 + 0.2 + 0.1 + 0.2) = 0.7.
     */
    @Test
    void portfolioExposures() {
        JsonNode loadings = ok("/v1/loadings?panel=" + PANEL + "&factors=a,b&date=" + last());
        JsonNode first = loadings.path("securities").get(0);
        JsonNode second = loadings.path("securities").get(1);
        String request = "{\"panel\":\"" + PANEL + "\",\"date\":\"" + last() + "\",\"factors\":[\"a\",\"b\"],\"holdings\":["
                + "{\"security\":\"" + code(0) + "\",\"weight\":0.5},{\"security\":\"" + code(1) + "\",\"weight\":-0.2},"
                + "{\"security\":\"" + code(LATE) + "\",\"weight\":0.1},{\"security\":\"NOBODY-WIDGETS\",\"weight\":0.2}]}";
        TestServer.Reply r = server.postJson("/v1/exposures", request, ADMIN);
        assertEquals(200, r.status(), r.body());
        FiniteJson.assertFinite(r, "exposures");
        JsonNode body = r.json();
        for (int j = 0; j < 2; j++) {
            double expected = 0.5 * first.path("betas").get(j).asDouble() - 0.2 * second.path("betas").get(j).asDouble();
            assertEquals(expected, body.path("exposures").get(j).asDouble(), 1e-15, "factor " + j);
        }
        assertEquals(0.7, body.path("coverage").asDouble(), 1e-15);
        assertEquals("[\"" + code(LATE) + "\",\"NOBODY-WIDGETS\"]", body.path("missing").toString());

        // nothing covered: exposures are null, coverage 0
        JsonNode none = server.postJson("/v1/exposures", "{\"panel\":\"" + PANEL + "\",\"date\":\"" + last()
                + "\",\"factors\":[\"a\",\"b\"],\"holdings\":[{\"security\":\"NOBODY-WIDGETS\",\"weight\":1}]}", ADMIN).json();
        assertEquals("[null,null]", none.path("exposures").toString());
        assertEquals(0.0, none.path("coverage").asDouble(), 0);
    }

    @Test
    void badInputIsAProblem() {
        String base = "/v1/loadings?panel=" + PANEL + "&factors=a,b";
        // unknown panel or factor named in the query: 400 naming it (a 404 is for names in the path)
        problem("/v1/loadings?panel=nowhere&factors=a,b", 400);
        problem("/v1/loadings?panel=nowhere&kind=characteristic&columns=leverage", 400);
        problem(base.replace("a,b", "a,ghost"), 400);
        problem("/v1/loadings?factors=a,b", 400);
        problem("/v1/loadings?panel=bad%20name&factors=a,b", 400);

        // a date that is not a grid date names its neighbours
        TestServer.Reply between = server.get(base + "&date=2020-06-15");
        FiniteJson.problem(between, 400, "date between grid dates");
        String detail = between.json().path("detail").asText();
        assertTrue(detail.contains("2020-05-31") && detail.contains("2020-06-30"), detail);
        TestServer.Reply early = server.get(base + "&date=2014-12-31");
        FiniteJson.problem(early, 400, "date before the first grid date");
        assertTrue(early.json().path("detail").asText().contains(GRID.get(0).toString()), early.body());
        problem(base + "&date=2020-02-30", 400);
        problem("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=leverage&date=2020-06-15", 400);

        // window and min_obs
        problem(base + "&window=500", 400);
        problem(base + "&window=3", 400);
        problem(base + "&window=0", 400);
        problem(base + "&window=60&min_obs=61", 400);
        problem(base + "&window=sixty", 400);

        // characteristic columns
        problem("/v1/loadings?panel=" + PANEL + "&kind=characteristic", 400);
        problem("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=shoe_size", 400);
        problem("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=leverage&factors=a", 400);
        problem("/v1/loadings?panel=" + PANEL + "&kind=style", 400);

        // one security's history
        problem("/v1/loadings/NOBODY-WIDGETS?panel=" + PANEL + "&factors=a,b", 404);
        problem("/v1/loadings/" + code(0) + "?panel=" + PANEL + "&factors=a,b&from=2020-03-01&to=2020-01-01", 400);

        // exposures
        String head = "{\"panel\":\"" + PANEL + "\",\"factors\":[\"a\",\"b\"],";
        problemPost(head + "\"holdings\":[]}", 400);
        problemPost("{\"panel\":\"" + PANEL + "\",\"factors\":[\"a\",\"b\"]}", 400);
        problemPost(head + "\"holdings\":[{\"security\":\"" + code(0) + "\",\"weight\":\"lots\"}]}", 400);
        problemPost(head + "\"holdings\":[{\"security\":\"" + code(0) + "\",\"weight\":1},{\"security\":\"" + code(0) + "\",\"weight\":1}]}", 400);
        problemPost(head + "\"date\":\"2020-06-15\",\"holdings\":[{\"security\":\"" + code(0) + "\",\"weight\":1}]}", 400);
        problemPost("{\"panel\":\"nowhere\",\"factors\":[\"a\",\"b\"],\"holdings\":[{\"security\":\"X\",\"weight\":1}]}", 400);
        problemPost(head + "\"holdings\":[{\"security\":\"" + code(0) + "\",\"weight\":1}],\"colour\":\"blue\"}", 400);
        problemPost("[1,2]", 400);

        // configuration
        problem("/v1/panels/nowhere/loadings-config", 404);
        FiniteJson.problem(server.putJson("/v1/panels/" + PANEL + "/loadings-config", "{\"window\":60}", ADMIN), 400, "config without factors");
        FiniteJson.problem(server.putJson("/v1/panels/" + PANEL + "/loadings-config", "{\"factors\":[\"ghost\"]}", ADMIN), 400, "config with an unknown factor");
    }

    // ---------------------------------------------------------------------------------------------------------------

    /**
     * Factors: a ~ N(0.008, 0.045^2), b ~ N(0.002, 0.03^2) per month. Security s: alpha ~ U(-0.003, 0.003),
     * beta_a ~ U(0.5, 1.5), beta_b ~ U(-0.8, 0.8), noise ~ N(0, sigma^2) with sigma ~ U(0.02, 0.05);
     * each return is missing with probability 0.07. The 30th security lists at month 60.
     */
    static void generate(Random random) {
        for (int t = 0; t <= MONTHS; t++) {
            GRID.add(YearMonth.of(2015, 1).plusMonths(t).atEndOfMonth());
            FA[t] = 0.008 + 0.045 * random.nextGaussian();
            FB[t] = 0.002 + 0.03 * random.nextGaussian();
        }
        double[] sigma = new double[SECURITIES];
        for (int s = 0; s < SECURITIES; s++) {
            ALPHA[s] = -0.003 + 0.006 * random.nextDouble();
            BETA_A[s] = 0.5 + random.nextDouble();
            BETA_B[s] = -0.8 + 1.6 * random.nextDouble();
            sigma[s] = 0.02 + 0.03 * random.nextDouble();
        }
        StringBuilder csv = new StringBuilder("date,security,return,size_score,leverage\n");
        StringBuilder append = new StringBuilder("date,security,return,size_score,leverage\n");
        for (int t = 0; t <= MONTHS; t++) {
            for (int s = 0; s < SECURITIES; s++) {
                HAS_ROW[s][t] = s != LATE || t >= LATE_FROM;
                double r = ALPHA[s] + BETA_A[s] * FA[t] + BETA_B[s] * FB[t] + sigma[s] * random.nextGaussian();
                boolean missing = random.nextDouble() < 0.07;
                RETURNS[s][t] = HAS_ROW[s][t] && !missing ? r : Double.NaN;
                double size = random.nextDouble();
                double leverage = 5 * random.nextGaussian();
                if (t == MONTHS - 1) {
                    SIZE_AT_LAST[s] = size;
                    leverage = s == OUTLIER ? 1000 : leverageAtLast(s);
                }
                if (!HAS_ROW[s][t]) {
                    continue;
                }
                StringBuilder out = t == MONTHS ? append : csv;
                out.append(GRID.get(t)).append(',').append(code(s)).append(',').append(missing ? "" : Double.toString(r))
                        .append(',').append(t == MONTHS - 1 && s == NO_SIZE ? "" : Double.toString(size))
                        .append(',').append(Double.toString(leverage)).append('\n');
            }
        }
        FB[B_GAP] = Double.NaN;
        panelCsv = csv.toString();
        appendCsv = append.toString();
    }

    /** -14..14 over the securities other than the outlier, in code order. */
    static double leverageAtLast(int s) {
        return (s < OUTLIER ? s : s - 1) - 14;
    }

    /** Row (and security index, all 30 having a row at the last date) whose leverage at the last date is v. */
    static int indexOfLeverage(int v) {
        int s = v + 14;
        return s < OUTLIER ? s : s + 1;
    }

    static String code(int s) {
        return String.format("S%04d", s + 1);
    }

    /** Defines (first call) and uploads months [from, to) of an external factor; factor b skips its gap. */
    static void external(String name, int from, int to) {
        if (from == 0) {
            TestServer.Reply put = server.putJson("/v1/factors/" + name,
                    "{\"method\":\"external\",\"theme\":\"risk\",\"rationale\":\"generated factor for the loadings test\"}", ADMIN);
            assertEquals(201, put.status(), put.body());
        }
        double[] values = name.equals("a") ? FA : FB;
        StringBuilder csv = new StringBuilder("date,return\n");
        for (int t = from; t < to; t++) {
            if (!Double.isNaN(values[t])) {
                csv.append(GRID.get(t)).append(',').append(Double.toString(values[t])).append('\n');
            }
        }
        JsonNode job = server.upload("/v1/factors/" + name + "/uploads", csv.toString());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }

    static JsonNode ok(String path) {
        return FiniteJson.ok(server, path);
    }

    static void problem(String path, int status) {
        FiniteJson.problem(server.get(path), status, path);
    }

    static void problemPost(String json, int status) {
        FiniteJson.problem(server.postJson("/v1/exposures", json, ADMIN), status, json);
    }
}
