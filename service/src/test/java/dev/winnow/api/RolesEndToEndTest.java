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
import java.time.YearMonth;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.TreeSet;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Factors and inputs over HTTP. The library: {@code rf} (external, no role) named by the market factor {@code mkt} as
 * its risk_free, so an input; {@code bench} (external, declared input, theme value); {@code deposit} (external,
 * declared factor) named by {@code mkt_deposit} as its risk_free, so a trial after all; and the sort factor
 * {@code val} (theme value). Inputs are served and usable everywhere but are no trials, in no theme and no default
 * regressor.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class RolesEndToEndTest {
    private static final int MONTHS = 60;
    private static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        List<LocalDate> dates = new ArrayList<>();
        for (int m = 0; m < MONTHS; m++) {
            dates.add(YearMonth.of(2015, 1).plusMonths(m).atEndOfMonth());
        }
        Random random = new Random(15);
        StringBuilder panel = new StringBuilder("date,security,return,market_cap,score\n");
        for (LocalDate d : dates) {
            for (int s = 0; s < 12; s++) {
                panel.append(d).append(",S").append(s).append(',').append(0.01 * random.nextGaussian()).append(',')
                        .append(100 + 10 * s).append(',').append(random.nextGaussian()).append('\n');
            }
        }
        assertEquals("succeeded", server.upload("/v1/panels/p/uploads", panel.toString()).path("state").asText());
        external("rf", "{\"method\":\"external\",\"theme\":\"rates\"}", dates, 0.002, 0.0001, random);
        external("bench", "{\"method\":\"external\",\"role\":\"input\",\"theme\":\"value\"}", dates, 0.005, 0.03, random);
        external("deposit", "{\"method\":\"external\",\"role\":\"factor\",\"theme\":\"rates\"}", dates, 0.001, 0.0002, random);
        build("mkt", "{\"panel\":\"p\",\"method\":\"market\",\"risk_free\":\"rf\",\"theme\":\"market\"}");
        build("mkt_deposit", "{\"panel\":\"p\",\"method\":\"market\",\"risk_free\":\"deposit\",\"theme\":\"market\"}");
        build("val", "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":3,\"theme\":\"value\"}");
    }

    private static void external(String name, String definition, List<LocalDate> dates, double mean, double sd, Random random) {
        var put = server.putJson("/v1/factors/" + name, definition, ADMIN);
        assertEquals(201, put.status(), put.body());
        StringBuilder csv = new StringBuilder("date,return\n");
        for (LocalDate d : dates) {
            csv.append(d).append(',').append(mean + sd * random.nextGaussian()).append('\n');
        }
        assertEquals("succeeded", server.upload("/v1/factors/" + name + "/uploads", csv.toString()).path("state").asText());
    }

    private static void build(String name, String definition) {
        var put = server.putJson("/v1/factors/" + name, definition, ADMIN);
        assertEquals(202, put.status(), put.body());
        assertEquals("succeeded", server.awaitJob(put.json().path("job").asText()).path("state").asText(), name);
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    @Order(1)
    void inputsAreNoTrialsAndSayWhy() {
        JsonNode table = server.get("/v1/evidence").json();
        assertEquals(Set.of("deposit", "mkt", "mkt_deposit", "val"), names(table.get("factors")));
        assertEquals(4, table.get("trials").asInt());
        Map<String, String> excluded = new HashMap<>();
        table.get("excluded").forEach(e -> excluded.put(e.get("factor").asText(), e.get("reason").asText()));
        assertEquals(Set.of("bench", "rf"), excluded.keySet());
        assertTrue(excluded.get("rf").contains("risk-free rate that factor 'mkt' subtracts"), excluded.get("rf"));
        assertTrue(excluded.get("bench").contains("\"role\": \"input\""), excluded.get("bench"));

        // the alias of one release gives the same answer; the old opposite is refused with what to do instead
        assertEquals(table, server.get("/v1/evidence?risk_free=exclude").json());
        TestServer.Reply include = server.get("/v1/evidence?risk_free=include");
        assertProblem(include, 400);
        assertTrue(include.json().get("detail").asText().contains("\"role\": \"factor\""), include.body());
        assertProblem(server.get("/v1/factors/val/evidence?risk_free=include"), 400);

        JsonNode evidence = server.get("/v1/factors/bench/evidence").json();
        assertEquals("not_enough_data", evidence.at("/significance/verdict").asText());
        assertTrue(evidence.at("/significance/reason").asText().contains("an input"), evidence.get("significance").toString());
    }

    @Test
    @Order(2)
    void factorAnswersSayTheRoleAsDecided() {
        Map<String, String> roles = new HashMap<>();
        server.get("/v1/factors").json().get("factors").forEach(f -> roles.put(f.get("name").asText(), f.get("role").asText()));
        assertEquals(Map.of("rf", "input", "bench", "input", "deposit", "factor", "mkt", "factor", "mkt_deposit", "factor",
                "val", "factor"), roles);
        JsonNode bench = server.get("/v1/factors/bench").json();
        assertEquals("input", bench.get("role").asText());
        assertEquals("input", bench.at("/definition/role").asText());
        JsonNode rf = server.get("/v1/factors/rf").json();
        assertEquals("input", rf.get("role").asText());
        assertTrue(rf.at("/definition/role").isMissingNode(), "an undeclared role is not written into the definition");
        assertProblem(server.putJson("/v1/factors/bad", "{\"method\":\"external\",\"role\":\"benchmark\"}", ADMIN), 400);
    }

    @Test
    @Order(3)
    void inputsAreUsableEverywhere() {
        assertEquals(MONTHS, server.get("/v1/factors/bench/returns").json().get("returns").size());
        assertEquals(200, server.get("/v1/factors/bench/summary").status());
        assertEquals(200, server.get("/v1/correlations?factors=val,bench,rf").status());
        TestServer.Reply models = server.get("/v1/model-tests?factors=bench&assets=val&risk_free=rf");
        assertEquals(200, models.status(), models.body());
        // named, an input is a regressor of the spanning regression; by default neither input is
        JsonNode named = server.get("/v1/factors/val/evidence?against=bench").json();
        assertEquals("[\"bench\"]", named.at("/redundancy/against").toString());
        JsonNode byDefault = server.get("/v1/factors/val/evidence").json();
        Set<String> regressors = names(byDefault.at("/redundancy/against"));
        assertFalse(regressors.contains("bench") || regressors.contains("rf"), regressors.toString());
        assertTrue(regressors.contains("mkt"), regressors.toString());
        // and no variant of a factor sharing its theme
        assertFalse(byDefault.at("/variants/members").toString().contains("bench"), byDefault.get("variants").toString());
    }

    @Test
    @Order(4)
    void inputsAreInNoTheme() {
        JsonNode themes = server.get("/v1/themes").json();
        assertFalse(themes.toString().contains("\"bench\"") || themes.toString().contains("\"rf\""), themes.toString());
        assertEquals("[\"val\"]", server.get("/v1/themes/value/returns").json().get("factors").toString());
    }

    @Test
    @Order(5)
    void anUndeclaredRateIsATrialOnceNoLiveDefinitionNamesIt() {
        assertEquals(204, server.delete("/v1/factors/mkt", ADMIN).status());
        JsonNode table = server.get("/v1/evidence").json();
        // every version ever built stays a trial, the retired market factor too
        assertEquals(Set.of("deposit", "mkt", "mkt_deposit", "rf", "val"), names(table.get("factors")));
        assertEquals("factor", server.get("/v1/factors/rf").json().get("role").asText());
    }

    private static Set<String> names(JsonNode rowsOrNames) {
        Set<String> out = new TreeSet<>();
        rowsOrNames.forEach(n -> out.add(n.isTextual() ? n.asText() : n.get("factor").asText()));
        return out;
    }
}
