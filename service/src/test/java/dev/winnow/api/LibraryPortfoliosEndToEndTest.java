package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;

import java.io.IOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Bucket portfolios named {@code <factor>:<portfolio>} in the risk system's reads: the aligned download checked
 * value by value against {@code GET /v1/factors/{f}/portfolios} (itself checked against the independent pandas
 * construction in PortfoliosEndToEndTest), the covariance of portfolio names against the covariance of the same
 * numbers uploaded as external series, and ETags that change when an append extends the portfolios.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class LibraryPortfoliosEndToEndTest {
    static TestServer server;
    static String panelHeader;
    static List<String> laterRows = new ArrayList<>();

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        JsonNode expected = CrossSectionEndToEndTest.readJson("xsection_expected.json").get("portfolios");
        // the panel's first 30 month ends now; the rest is appended by appendExtendsThePortfoliosAndChangesTheEtag
        String[] lines = CrossSectionEndToEndTest.readText("xsection_panel.csv").split("\n");
        panelHeader = lines[0];
        LocalDate cut = LocalDate.parse(lines[1].substring(0, 10)).plusMonths(30);
        StringBuilder first = new StringBuilder(panelHeader).append('\n');
        for (int i = 1; i < lines.length; i++) {
            if (LocalDate.parse(lines[i].substring(0, 10)).isBefore(cut)) {
                first.append(lines[i]).append('\n');
            } else {
                laterRows.add(lines[i]);
            }
        }
        JsonNode job = server.upload("/v1/panels/xs/uploads", first.toString());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        PortfoliosEndToEndTest.defineReferenceFactors(server, expected, List.of("value_q5", "value_2x3"));
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    /**
     * Every column of {@code /v1/returns} equals, date by date, the portfolio's column of
     * {@code /v1/factors/{f}/portfolios} (or, for a plain factor name, {@code /v1/factors/{f}/returns}) with the same
     * range, frequency and form: the same value to the bit, null exactly where the single endpoint has no return.
     */
    static void assertAgreesWithPortfolios(List<String> names, String query) {
        JsonNode body = FiniteJson.ok(server, "/v1/returns?factors=" + String.join(",", names) + query);
        List<String> dates = texts(body.get("dates"));
        int compared = 0;
        for (int i = 0; i < names.size(); i++) {
            String name = names.get(i);
            TreeMap<String, Double> want = single(name, query);
            JsonNode column = body.get("returns").get(name);
            assertEquals(dates.size(), column.size(), name);
            int present = 0;
            for (int t = 0; t < dates.size(); t++) {
                Double w = want.get(dates.get(t));
                if (w == null) {
                    assertTrue(column.get(t).isNull(), name + " at " + dates.get(t) + " " + query);
                } else {
                    assertEquals(w, column.get(t).asDouble(), 0.0, name + " at " + dates.get(t) + " " + query);
                    present++;
                }
            }
            assertEquals(want.size(), present, name + ": every date of the single endpoint is in the download " + query);
            assertEquals(name, body.get("factors").get(i).get("name").asText());
            compared += present;
        }
        assertTrue(compared >= 3 * names.size(), "compared only " + compared);
    }

    /** Date -> value of one name from its own endpoint, non-null values only. */
    static TreeMap<String, Double> single(String name, String query) {
        TreeMap<String, Double> out = new TreeMap<>();
        int colon = name.indexOf(':');
        String q = query.isEmpty() ? "" : "?" + query.substring(1);
        if (colon < 0) {
            JsonNode r = FiniteJson.ok(server, "/v1/factors/" + name + "/returns" + q);
            for (int t = 0; t < r.get("dates").size(); t++) {
                out.put(r.get("dates").get(t).asText(), r.get("returns").get(t).asDouble());
            }
            return out;
        }
        JsonNode p = FiniteJson.ok(server, "/v1/factors/" + name.substring(0, colon) + "/portfolios" + q);
        JsonNode column = p.get("returns").get(name.substring(colon + 1));
        for (int t = 0; t < p.get("dates").size(); t++) {
            if (!column.get(t).isNull()) {
                out.put(p.get("dates").get(t).asText(), column.get(t).asDouble());
            }
        }
        return out;
    }

    @Test
    void portfolioColumnsEqualThePortfoliosEndpointValueByValue() {
        List<String> names = List.of("value_q5:1", "value_q5:5", "value_2x3:big_high", "value_2x3:small_low", "value_q5");
        assertAgreesWithPortfolios(names, "");
        assertAgreesWithPortfolios(names, "&from=2010-06-01&to=2011-12-31");
        assertAgreesWithPortfolios(names, "&frequency=quarterly");
        assertAgreesWithPortfolios(names, "&frequency=quarterly&form=cumulative");
        assertAgreesWithPortfolios(List.of("value_2x3:small_high", "value_q5:3"), "&form=cumulative&from=2010-03-01");

        TestServer.Reply csv = server.get("/v1/returns?factors=value_q5:1,value_2x3:big_high&format=csv");
        assertEquals(200, csv.status(), csv.body());
        assertEquals("date,value_q5:1,value_2x3:big_high", csv.body().split("\n")[0]);
    }

    /**
     * The covariance of portfolio names equals, to the bit, the covariance of the same numbers uploaded as external
     * factors: the names read exactly the portfolios' series (the estimator itself is checked against numpy in
     * LibraryEndToEndTest).
     */
    @Test
    void covarianceOfPortfolioNamesEqualsTheCovarianceOfTheSameNumbers() {
        List<String> names = List.of("value_q5:1", "value_q5:5", "value_2x3:big_high");
        List<String> copies = new ArrayList<>();
        for (String name : names) {
            String copy = "copy_" + name.replace(':', '_');
            TreeMap<LocalDate, Double> series = new TreeMap<>();
            single(name, "").forEach((d, v) -> series.put(LocalDate.parse(d), v));
            AnalyticsEndToEndTest.external(server, copy, series);
            copies.add(copy);
        }
        for (String query : new String[] {"", "&annualize=false", "&half_life=6&nw_lags=2", "&window=12&to=2011-12-31", "&frequency=quarterly"}) {
            JsonNode named = FiniteJson.ok(server, "/v1/covariance?factors=" + String.join(",", names) + query);
            JsonNode copied = FiniteJson.ok(server, "/v1/covariance?factors=" + String.join(",", copies) + query);
            assertEquals(names, texts(named.get("factors")));
            for (String field : new String[] {"covariance", "correlation", "volatility", "observations", "first", "last"}) {
                assertEquals(copied.get(field), named.get(field), field + " " + query);
            }
        }
    }

    @Test
    void badPortfolioNamesAreProblemsThatSayWhatExists() {
        TestServer.Reply nine = server.get("/v1/returns?factors=value_q5:9");
        FiniteJson.problem(nine, 400, "value_q5:9");
        assertTrue(nine.json().get("detail").asText().contains("1, 2, 3, 4, 5"), nine.body());
        TestServer.Reply cash = server.get("/v1/covariance?factors=value_q5:1,cash:1");
        FiniteJson.problem(cash, 400, "cash:1");
        assertTrue(cash.json().get("detail").asText().contains("no portfolios"), cash.body());
        FiniteJson.problem(server.get("/v1/covariance?factors=nope:1,value_q5:1"), 400, "nope:1");
        TestServer.Reply net = server.get("/v1/returns?factors=value_q5,value_q5:1&net=true");
        FiniteJson.problem(net, 400, "net");
        assertTrue(net.json().get("detail").asText().contains("value_q5:1"), net.body());
        FiniteJson.problem(server.get("/v1/returns?factors=value_q5:1,value_q5:1"), 400, "twice");
    }

    /**
     * An append to the panel extends the factors and their portfolios: the ETag of an answer over portfolio names
     * changes (the portfolios' data version is the factor version's), the old ETag no longer answers 304, and the
     * new answer again equals the portfolios endpoint. Runs last: it changes the data the other tests read.
     */
    @Test
    @Order(Integer.MAX_VALUE)
    void appendExtendsThePortfoliosAndChangesTheEtag() {
        String path = "/v1/returns?factors=value_q5:2,value_2x3:big_low";
        TestServer.Reply before = server.get(path);
        String etag = before.header("ETag");
        assertEquals(304, server.send(server.request(path, ADMIN).header("If-None-Match", etag).GET()).status());
        String covPath = "/v1/covariance?factors=value_q5:2,value_2x3:big_low";
        String covEtag = server.get(covPath).header("ETag");

        JsonNode job = server.upload("/v1/panels/xs/uploads", panelHeader + "\n" + String.join("\n", laterRows) + "\n");
        assertEquals("succeeded", job.path("state").asText(), job.toString());

        TestServer.Reply after = server.get(path);
        assertNotEquals(etag, after.header("ETag"));
        assertEquals(200, server.send(server.request(path, ADMIN).header("If-None-Match", etag).GET()).status());
        assertTrue(after.json().get("dates").size() > before.json().get("dates").size(), "the append added dates");
        assertNotEquals(covEtag, server.get(covPath).header("ETag"));
        assertAgreesWithPortfolios(List.of("value_q5:2", "value_2x3:big_low"), "");
    }

    private static List<String> texts(JsonNode array) {
        List<String> out = new ArrayList<>();
        array.forEach(n -> out.add(n.asText()));
        return out;
    }
}
