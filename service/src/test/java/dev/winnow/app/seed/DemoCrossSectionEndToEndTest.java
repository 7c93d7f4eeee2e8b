package dev.winnow.app.seed;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.api.TestServer;
import java.io.IOException;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The demo scenario as a known truth for the cross-sectional evidence, over HTTP on a temp store. The truth is the
 * return model of seed-data/README.md: book_to_price, momentum_12_1, gross_profitability, asset_growth (negative) and
 * ln(market_cap) (negative) price next month's returns with the planted lambdas of its table, the three noise
 * characteristics price nothing.
 */
class DemoCrossSectionEndToEndTest {
    /** Planted lambdas (monthly return per unit cross-sectional z-score), from seed-data/README.md. */
    private static final Map<String, Double> PLANTED = Map.of("value", 0.0024, "momentum", 0.0022, "profitability", 0.0020,
            "investment", -0.0020, "size", -0.0022);
    private static final List<String> NOISE = List.of("noise_alpha", "noise_beta", "noise_gamma");

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

    /**
     * value_annual_june sorts on book_to_price into equal-weighted quintiles: with a premium linear in the z-score,
     * every step from one quintile to the next has a positive mean and the verdict is holds. (The cap-weighted
     * value_quintile_cap is not asserted to rise at every step: each of its quintiles is dominated by a few large
     * companies, whose own noise is larger than a step's planted gap of about 0.17% a month; seed-data/README.md says
     * the same of its spread. What is asserted is that none of its steps is significantly against the premium.)
     */
    @Test
    void valuesQuintilePortfoliosRiseAcrossBuckets() {
        JsonNode m = server.get("/v1/factors/value_annual_june/evidence").json().path("monotonicity");
        assertEquals("holds", m.path("verdict").asText(), m.toString());
        assertEquals(4, m.path("steps").size());
        m.path("steps").forEach(step -> assertTrue(step.path("mean").asDouble() > 0, step.toString()));
        assertEquals(4, m.path("steps_in_direction").asInt());
        assertEquals(1.0, m.path("rank_correlation").asDouble(), 1e-12);
        double previous = Double.NEGATIVE_INFINITY;
        for (JsonNode bucket : m.path("buckets")) {
            assertTrue(bucket.path("mean").asDouble() > previous, m.path("buckets").toString());
            previous = bucket.path("mean").asDouble();
        }
        JsonNode cap = server.get("/v1/factors/value_quintile_cap/evidence").json().path("monotonicity");
        assertTrue(cap.path("min_step_t").asDouble() > -2, cap.toString());
        JsonNode buckets = cap.path("buckets");
        assertTrue(buckets.get(4).path("mean").asDouble() > buckets.get(0).path("mean").asDouble(), buckets.toString());
    }

    /**
     * The noise characteristics predict nothing: at every horizon asked, the mean IC is within two standard errors
     * (stdev / sqrt(n), the summary's t_stat) of zero. The planted characteristics, as a control, have an IC at one
     * month whose t exceeds 3 with the planted sign (asset growth negative: the raw signal is used).
     */
    @Test
    void noiseFactorsHaveNoInformationCoefficient() {
        for (String noise : NOISE) {
            JsonNode summary = server.get("/v1/factors/" + noise + "/ic?horizons=1,3,6,12").json().path("summary");
            assertEquals(4, summary.size());
            for (JsonNode s : summary) {
                assertTrue(s.path("n").asInt() > 250, s.toString());
                double standardError = s.path("stdev").asDouble() / Math.sqrt(s.path("n").asInt());
                assertTrue(Math.abs(s.path("mean").asDouble()) < 2 * standardError, noise + ": " + s);
            }
        }
        Map<String, Double> sign = Map.of("value_quintile_cap", 1.0, "momentum", 1.0, "quality", 1.0, "investment", -1.0);
        sign.forEach((factor, s) -> {
            JsonNode h1 = server.get("/v1/factors/" + factor + "/ic").json().path("summary").get(0);
            assertTrue(s * h1.path("t_stat").asDouble() > 3, factor + ": " + h1);
        });
    }

    /**
     * Monthly cross-sectional regressions of next month's return on all eight characteristics at once, z-scored per
     * month as the generator's return model uses them: every planted slope is significant (|NW t| > 3) with its
     * planted sign and lies within two standard errors of its planted lambda; every noise slope has |NW t| < 2.
     */
    @Test
    void famaMacBethFindsThePlantedCharacteristics() {
        String body = "{\"panel\":\"demo-market\",\"standardize\":true,\"signals\":{\"value\":\"book_to_price\","
                + "\"momentum\":\"momentum_12_1\",\"profitability\":\"gross_profitability\",\"investment\":\"asset_growth\","
                + "\"size\":{\"log\":\"market_cap\"},\"noise_alpha\":\"noise_alpha\",\"noise_beta\":\"noise_beta\","
                + "\"noise_gamma\":\"noise_gamma\"}}";
        TestServer.Reply reply = server.postJson("/v1/fama-macbeth", body, ADMIN);
        assertEquals(200, reply.status(), reply.body());
        JsonNode fm = reply.json();
        assertEquals(299, fm.path("periods").asInt(), "one regression per month after the first");
        Map<String, JsonNode> coefficients = new HashMap<>();
        fm.path("coefficients").forEach(c -> coefficients.put(c.path("name").asText(), c));
        PLANTED.forEach((name, lambda) -> {
            JsonNode c = coefficients.get(name);
            double mean = c.path("mean").asDouble();
            assertTrue(Math.signum(lambda) * c.path("nw_t_stat").asDouble() > 3, name + ": " + c);
            double standardError = c.path("stdev").asDouble() / Math.sqrt(fm.path("periods").asInt());
            assertTrue(Math.abs(mean - lambda) < 2 * standardError, name + " slope " + mean + " vs planted " + lambda + ": " + c);
        });
        for (String noise : NOISE) {
            JsonNode c = coefficients.get(noise);
            assertTrue(Math.abs(c.path("nw_t_stat").asDouble()) < 2, noise + ": " + c);
        }
    }
}
