package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code POST /v1/risk} on the real server, over a generated monthly panel of 12 fictional securities driven by two
 * external factors (seeded). The answer is checked piece by piece against the endpoints it is defined by: the
 * exposures of the active weights against {@code POST /v1/exposures}, F against {@code GET /v1/covariance} at the
 * same date and settings, the residual volatilities against {@code GET /v1/loadings}; the decomposition is
 * recomputed here from those (x'Fx, 12 sum w^2 s^2, F x / sigma) and must add up to the total to 1e-12. The formulas
 * themselves are checked by hand and against numpy in {@code PortfolioRiskTest}.
 */
class RiskEndToEndTest {
    static final int SECURITIES = 12;
    static final int MONTHS = 48;
    static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        Random random = new Random(1111);
        List<LocalDate> months = AnalyticsEndToEndTest.monthEnds(2018, 1, MONTHS);
        TreeMap<LocalDate, Double> a = new TreeMap<>();
        TreeMap<LocalDate, Double> b = new TreeMap<>();
        for (LocalDate m : months) {
            a.put(m, Math.round((0.006 + 0.04 * random.nextGaussian()) * 1e8) / 1e8);
            b.put(m, Math.round((0.002 + 0.025 * random.nextGaussian()) * 1e8) / 1e8);
        }
        AnalyticsEndToEndTest.external(server, "a", a);
        AnalyticsEndToEndTest.external(server, "b", b);
        StringBuilder csv = new StringBuilder("date,security,return,market_cap\n");
        for (LocalDate m : months) {
            for (int i = 0; i < SECURITIES; i++) {
                double r = 0.001 * i + (0.6 + 0.1 * i) * a.get(m) + (0.5 - 0.1 * i) * b.get(m) + (0.01 + 0.003 * i) * random.nextGaussian();
                csv.append(m).append(",QR").append(String.format(Locale.ROOT, "%02d", i)).append(',')
                        .append(String.format(Locale.ROOT, "%.8f", r)).append(",100\n");
            }
        }
        JsonNode job = server.upload("/v1/panels/dock/uploads", csv.toString());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    void riskAgreesWithExposuresCovarianceAndLoadings() {
        String request = "{\"panel\":\"dock\",\"date\":\"2021-06-30\",\"factors\":[\"a\",\"b\"],\"window\":36,"
                + "\"holdings\":[{\"security\":\"QR01\",\"weight\":0.5},{\"security\":\"QR04\",\"weight\":0.3},{\"security\":\"QR09\",\"weight\":0.2}],"
                + "\"benchmark\":[{\"security\":\"QR04\",\"weight\":0.25},{\"security\":\"QR07\",\"weight\":0.25},"
                + "{\"security\":\"QR10\",\"weight\":0.5},{\"security\":\"NOPE\",\"weight\":0.0}],"
                + "\"covariance\":{\"half_life\":12,\"nw_lags\":1,\"window\":30}}";
        TestServer.Reply reply = server.postJson("/v1/risk", request, ADMIN);
        assertEquals(200, reply.status(), reply.body());
        FiniteJson.assertFinite(reply, "risk");
        JsonNode risk = reply.json();
        // active weights, security by security: QR01 0.5, QR04 0.3-0.25, QR09 0.2, QR07 -0.25, QR10 -0.5, NOPE 0
        Map<String, Double> active = new HashMap<>(Map.of("QR01", 0.5, "QR04", 0.3 - 0.25, "QR09", 0.2, "QR07", -0.25, "QR10", -0.5, "NOPE", 0.0));
        StringBuilder holdings = new StringBuilder();
        for (String s : List.of("QR01", "QR04", "QR09", "QR07", "QR10", "NOPE")) {
            holdings.append(holdings.length() == 0 ? "" : ",").append("{\"security\":\"").append(s).append("\",\"weight\":").append(active.get(s)).append('}');
        }
        JsonNode exposures = server.postJson("/v1/exposures", "{\"panel\":\"dock\",\"date\":\"2021-06-30\",\"factors\":[\"a\",\"b\"],"
                + "\"window\":36,\"holdings\":[" + holdings + "]}", ADMIN).json();
        double[] x = {exposures.get("exposures").get(0).asDouble(), exposures.get("exposures").get(1).asDouble()};
        assertEquals(x[0], risk.get("exposures").get(0).asDouble(), 0.0);
        assertEquals(x[1], risk.get("exposures").get(1).asDouble(), 0.0);
        assertEquals(exposures.get("coverage").asDouble(), risk.get("coverage").asDouble(), 0.0);
        assertEquals("[\"NOPE\"]", risk.get("missing").toString());

        JsonNode cov = FiniteJson.ok(server, "/v1/covariance?factors=a,b&to=2021-06-30&window=30&half_life=12&nw_lags=1&frequency=monthly");
        assertEquals("2021-06-30", cov.get("last").asText());
        double[][] f = new double[2][2];
        for (int i = 0; i < 2; i++) {
            for (int j = 0; j < 2; j++) {
                f[i][j] = cov.get("covariance").get(i).get(j).asDouble();
            }
        }
        JsonNode loadings = FiniteJson.ok(server, "/v1/loadings?panel=dock&factors=a,b&window=36&date=2021-06-30");
        double specific = 0;
        for (JsonNode row : loadings.get("securities")) {
            Double w = active.get(row.get("security").asText());
            if (w != null) {
                specific += w * w * row.get("residual_vol").asDouble() * row.get("residual_vol").asDouble();
            }
        }
        specific *= 12; // monthly panel: 12 periods a year
        double[] fx = {f[0][0] * x[0] + f[0][1] * x[1], f[1][0] * x[0] + f[1][1] * x[1]};
        double factorVariance = x[0] * fx[0] + x[1] * fx[1];
        double sigma = Math.sqrt(factorVariance + specific);
        assertEquals(sigma, risk.get("total_volatility").asDouble(), 1e-14);
        assertEquals(Math.sqrt(factorVariance), risk.get("factor_volatility").asDouble(), 1e-14);
        assertEquals(Math.sqrt(specific), risk.get("specific_volatility").asDouble(), 1e-14);
        double sum = risk.get("specific_contribution").asDouble();
        double shares = risk.get("specific_share").asDouble();
        assertEquals(specific / sigma, sum, 1e-14);
        for (int k = 0; k < 2; k++) {
            JsonNode c = risk.get("contributions").get(k);
            assertEquals(k == 0 ? "a" : "b", c.get("factor").asText());
            assertEquals(fx[k] / sigma, c.get("marginal").asDouble(), 1e-14);
            assertEquals(x[k] * fx[k] / sigma, c.get("contribution").asDouble(), 1e-14);
            sum += c.get("contribution").asDouble();
            shares += c.get("share").asDouble();
        }
        assertEquals(risk.get("total_volatility").asDouble(), sum, 1e-12, "Euler: contributions add up to the total");
        assertEquals(1.0, shares, 1e-12);
    }

    @Test
    void readScopeAndClearProblems() {
        String token = server.postJson("/v1/tokens", "{\"name\":\"riskdesk\",\"scope\":\"read\"}", ADMIN).json().get("token").asText();
        TestServer.Reply ok = server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[{\"security\":\"QR02\",\"weight\":1}]}", token);
        assertEquals(200, ok.status(), ok.body());
        assertTrue(ok.json().get("total_volatility").asDouble() > 0);
        FiniteJson.problem(server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[{\"security\":\"NOPE\",\"weight\":1}]}", token), 400, "none covered");
        FiniteJson.problem(server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[{\"security\":\"QR02\",\"weight\":1}],"
                + "\"covariance\":{\"half_life\":-1}}", token), 400, "half-life");
        FiniteJson.problem(server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[{\"security\":\"QR02\",\"weight\":1}],"
                + "\"covariance\":{\"lags\":1}}", token), 400, "unknown field");
        FiniteJson.problem(server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[{\"security\":\"QR02\",\"weight\":1}],"
                + "\"benchmark\":[{\"security\":\"QR02\",\"weight\":1}]}", token), 400, "zero active weights");
        FiniteJson.problem(server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a\"],\"window\":36,\"holdings\":[]}", token), 400, "empty");
        TestServer.Reply portfolio = server.postJson("/v1/risk", "{\"panel\":\"dock\",\"factors\":[\"a:1\"],\"window\":36,"
                + "\"holdings\":[{\"security\":\"QR02\",\"weight\":1}]}", token);
        FiniteJson.problem(portfolio, 400, "a portfolio name as a risk factor");
        assertTrue(portfolio.json().get("detail").asText().contains("names a portfolio"), portfolio.body());
    }
}
