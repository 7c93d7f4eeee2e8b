package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;

import java.net.http.HttpRequest;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Random;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A panel uploaded in pieces, extended date by date and then revised gives, for every method and calendar, exactly the
 * series (spread, legs, net, turnover) of the corrected panel built at once: compared as JSON text, which prints each
 * double's shortest round-trip decimal, so equal text means equal bits. A late revision of a long panel recomputes
 * only the dates after the last checkpoint before it, with the same outcome.
 */
class AppendAndRevisionEndToEndTest {
    static final String[] DEFINITIONS = {
        "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":3}",
        "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":4,\"weighting\":\"cap\",\"rebalance\":\"monthly\",\"cost_bps\":25}",
        "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"score\",\"direction\":\"low_minus_high\",\"rebalance\":\"quarterly\",\"lag\":2}",
        "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"value\",\"rebalance\":\"annual\",\"rebalance_month\":3,\"cost_bps\":10}",
        "{\"panel\":\"p\",\"method\":\"size_sort\",\"signal\":\"value\",\"rebalance\":\"monthly\",\"cost_bps\":5}",
        "{\"panel\":\"p\",\"method\":\"size_sort\",\"signal\":\"value\",\"output\":\"size\"}",
        "{\"panel\":\"p\",\"method\":\"market\",\"risk_free\":\"rf\",\"cost_bps\":1}",
        "{\"panel\":\"p\",\"method\":\"market\",\"weighting\":\"equal\",\"rebalance\":\"monthly\",\"universe\":{\"labels\":{\"tier\":{\"include\":[\"main\"]}}}}",
        "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"score\",\"universe\":{\"min_market_cap\":50},\"breakpoints\":{\"column\":\"tier\",\"equals\":\"main\"}}",
    };

    @Test
    void piecesAppendsAndARevisionEqualTheCorrectedPanelBuiltAtOnce() throws Exception {
        List<LocalDate> dates = businessDays(LocalDate.of(2021, 1, 4), 140);
        Random random = new Random(20211);
        List<String[]> rows = panelRows(dates, 24, random);
        int revisedDate = 70;
        List<String[]> corrected = corrected(rows, dates.get(revisedDate));
        String rf = riskFree(dates, -1);

        try (TestServer atOnce = new TestServer(); TestServer pieces = new TestServer()) {
            // all at once, corrected data
            setUpRiskFree(atOnce, rf);
            assertEquals("succeeded", atOnce.upload("/v1/panels/p/uploads", csv(corrected, 0, dates.size(), dates)).path("state").asText());
            defineAll(atOnce);

            // in pieces: the first 60 dates, definitions, then appends of 1, 9 and the rest, then the revision
            setUpRiskFree(pieces, rf);
            assertEquals("succeeded", pieces.upload("/v1/panels/p/uploads", csv(rows, 0, 60, dates)).path("state").asText());
            defineAll(pieces);
            int[] cuts = {60, 61, 70, dates.size()};
            for (int c = 0; c + 1 < cuts.length; c++) {
                JsonNode job = pieces.upload("/v1/panels/p/uploads", csv(rows, cuts[c], cuts[c + 1], dates));
                assertEquals("succeeded", job.path("state").asText(), job.toString());
                assertEquals("extended", job.path("report").path("factors").get(0).path("action").asText());
            }
            String etagBefore = pieces.get("/v1/factors/f0/returns").header("ETag");
            var revise = pieces.send(pieces.request("/v1/panels/p/uploads?mode=revise", ADMIN).header("Content-Type", "text/csv")
                    .POST(HttpRequest.BodyPublishers.ofString(csv(corrected, revisedDate, revisedDate + 1, dates))));
            JsonNode revision = pieces.awaitJob(revise.json().path("job").asText());
            assertEquals("succeeded", revision.path("state").asText(), revision.toString());
            assertEquals(DEFINITIONS.length, revision.path("report").path("factors").size(), revision.toString());
            assertEquals("rebuilt", revision.path("report").path("factors").get(0).path("action").asText());
            assertNotEquals(etagBefore, pieces.get("/v1/factors/f0/returns").header("ETag"), "a revision changes the series ETag");

            assertEquals(atOnce.get("/v1/panels/p").json().path("rows"), pieces.get("/v1/panels/p").json().path("rows"));
            assertSameSeries(atOnce, pieces);
        }
    }

    /**
     * A revision near the end of a panel longer than two checkpoint segments (252 dates each) resumes every factor
     * from the checkpoint after 504 dates and recomputes only the tail; so does a revision of the risk-free series for
     * the factor that subtracts it. The series still equal those of a server that got the corrected data at once.
     */
    @Test
    void aLateRevisionOfALongPanelRecomputesOnlyTheTail() throws Exception {
        List<LocalDate> dates = businessDays(LocalDate.of(2018, 1, 1), 600);
        List<String[]> rows = panelRows(dates, 12, new Random(20180));
        int revisedDate = 560;
        int revisedRiskFree = 580;
        String resumedFrom = dates.get(503).toString();
        try (TestServer atOnce = new TestServer(); TestServer pieces = new TestServer()) {
            setUpRiskFree(atOnce, riskFree(dates, revisedRiskFree));
            assertEquals("succeeded", atOnce.upload("/v1/panels/p/uploads", csv(corrected(rows, dates.get(revisedDate)), 0, dates.size(), dates))
                    .path("state").asText());
            defineAll(atOnce);

            setUpRiskFree(pieces, riskFree(dates, -1));
            assertEquals("succeeded", pieces.upload("/v1/panels/p/uploads", csv(rows, 0, dates.size(), dates)).path("state").asText());
            defineAll(pieces);
            JsonNode revision = pieces.upload("/v1/panels/p/uploads?mode=revise",
                    csv(corrected(rows, dates.get(revisedDate)), revisedDate, revisedDate + 1, dates));
            assertEquals("succeeded", revision.path("state").asText(), revision.toString());
            JsonNode factors = revision.path("report").path("factors");
            assertEquals(DEFINITIONS.length, factors.size(), revision.toString());
            for (JsonNode f : factors) {
                assertEquals("rebuilt", f.path("action").asText(), f.toString());
                assertEquals(resumedFrom, f.path("rebuilt_from").asText(), f.toString());
                assertEquals(dates.size() - 504, f.path("recomputed_dates").asInt(), f.toString());
                assertTrue(f.path("new_observations").asInt() <= dates.size() - 504, f.toString());
            }

            String rfRevision = "date,return\n" + dates.get(revisedRiskFree) + "," + riskFreeValue(revisedRiskFree, revisedRiskFree) + "\n";
            JsonNode rfJob = pieces.upload("/v1/factors/rf/uploads?mode=revise", rfRevision);
            assertEquals("succeeded", rfJob.path("state").asText(), rfJob.toString());
            JsonNode dependents = rfJob.path("report").path("factors");
            assertEquals(1, dependents.size(), rfJob.toString());
            assertEquals("f6", dependents.get(0).path("factor").asText());
            assertEquals(resumedFrom, dependents.get(0).path("rebuilt_from").asText(), rfJob.toString());

            assertSameSeries(atOnce, pieces);
        }
    }

    /**
     * Every factor's spread, legs, net, turnover and stored portfolios (buckets, the six of a 2x3 sort; the same 409
     * for the market) as JSON text, and its observation count, on both servers.
     */
    private static void assertSameSeries(TestServer expected, TestServer actual) {
        for (int i = 0; i < DEFINITIONS.length; i++) {
            String f = "/v1/factors/f" + i;
            for (String query : new String[] {"/returns", "/returns?leg=long", "/returns?leg=short", "/returns?net=true", "/turnover",
                    "/portfolios"}) {
                assertEquals(expected.get(f + query).body(), actual.get(f + query).body(), "f" + i + query + " " + DEFINITIONS[i]);
            }
            JsonNode observations = expected.get(f).json().path("observations");
            assertTrue(observations.asInt() >= 20, "f" + i + " has too few observations to test: " + observations);
            assertEquals(observations, actual.get(f).json().path("observations"));
        }
    }

    /** The rows with the returns of one date corrected (missing ones filled). */
    private static List<String[]> corrected(List<String[]> rows, LocalDate date) {
        List<String[]> corrected = new ArrayList<>();
        for (String[] row : rows) {
            String[] copy = row.clone();
            if (copy[0].equals(date.toString())) {
                copy[2] = copy[2].isEmpty() ? "0.001" : String.format(Locale.ROOT, "%.6f", Double.parseDouble(copy[2]) + 0.01);
            }
            corrected.add(copy);
        }
        return corrected;
    }

    private static void defineAll(TestServer server) {
        for (int i = 0; i < DEFINITIONS.length; i++) {
            var put = server.putJson("/v1/factors/f" + i, DEFINITIONS[i], ADMIN);
            assertEquals(202, put.status(), put.body());
            JsonNode job = server.awaitJob(put.json().path("job").asText());
            assertEquals("succeeded", job.path("state").asText(), DEFINITIONS[i] + " " + job);
        }
    }

    private static void setUpRiskFree(TestServer server, String csv) {
        assertEquals(201, server.putJson("/v1/factors/rf", "{\"method\":\"external\"}", ADMIN).status());
        assertEquals("succeeded", server.upload("/v1/factors/rf/uploads", csv).path("state").asText());
    }

    /** Invented data: 24 securities with a persistent score, a value signal, caps, tiers, some gaps and delistings. */
    private static List<String[]> panelRows(List<LocalDate> dates, int securities, Random random) {
        List<String[]> rows = new ArrayList<>();
        double[] cap = new double[securities];
        for (int s = 0; s < securities; s++) {
            cap[s] = 20 + random.nextInt(500);
        }
        for (int t = 0; t < dates.size(); t++) {
            for (int s = 0; s < securities; s++) {
                if (s == 5 && t > 90 || s == 7 && t < 20 || random.nextDouble() < 0.02) {
                    continue; // delisted, listed late, or a missing row
                }
                double r = 0.0004 * (s % 5 - 2) + 0.01 * random.nextGaussian();
                boolean missingReturn = random.nextDouble() < 0.02;
                cap[s] *= 1 + r;
                rows.add(new String[] {
                    dates.get(t).toString(), "S" + s,
                    missingReturn ? "" : String.format(Locale.ROOT, "%.6f", r),
                    random.nextDouble() < 0.01 ? "" : String.format(Locale.ROOT, "%.4f", cap[s]),
                    random.nextDouble() < 0.03 ? "" : String.valueOf((s * 7 + t / 10) % 11),
                    String.format(Locale.ROOT, "%.5f", Math.sin(s + t / 30.0)),
                    s % 3 == 0 ? "main" : "growth"});
            }
        }
        return rows;
    }

    private static String csv(List<String[]> rows, int fromDate, int toDate, List<LocalDate> dates) {
        StringBuilder sb = new StringBuilder("date,security,return,market_cap,score,value,tier\n");
        LocalDate first = dates.get(fromDate);
        LocalDate last = dates.get(toDate - 1);
        for (String[] row : rows) {
            LocalDate d = LocalDate.parse(row[0]);
            if (!d.isBefore(first) && !d.isAfter(last)) {
                sb.append(String.join(",", row)).append('\n');
            }
        }
        return sb.toString();
    }

    /** The risk-free series, its value at date {@code corrected} (or none, -1) corrected. */
    private static String riskFree(List<LocalDate> dates, int corrected) {
        StringBuilder sb = new StringBuilder("date,return\n");
        for (int t = 0; t < dates.size(); t++) {
            if (t != 33) { // one date without a risk-free return: the market factor has none there
                sb.append(dates.get(t)).append(',').append(riskFreeValue(t, corrected)).append('\n');
            }
        }
        return sb.toString();
    }

    private static String riskFreeValue(int t, int corrected) {
        return String.format(Locale.ROOT, "%.7f", t == corrected ? 0.0004 : 0.0001 + 0.000001 * (t % 9));
    }

    private static List<LocalDate> businessDays(LocalDate start, int n) {
        List<LocalDate> out = new ArrayList<>();
        for (LocalDate d = start; out.size() < n; d = d.plusDays(1)) {
            if (d.getDayOfWeek() != DayOfWeek.SATURDAY && d.getDayOfWeek() != DayOfWeek.SUNDAY) {
                out.add(d);
            }
        }
        return out;
    }
}
