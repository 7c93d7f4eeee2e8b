package dev.winnow.app.seed;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.api.TestServer;
import java.io.IOException;
import java.net.http.HttpRequest;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;

/**
 * The demo scenario as a known truth, end to end over HTTP. seed-data/README.md documents the planted premia: momentum,
 * gross profitability and asset growth (low minus high) carry one, the three noise characteristics carry none. After
 * uploading the committed panel and series and defining the 15 factors of seed-data/factors.json, the evidence must
 * say so: the planted sort factors momentum, quality and investment pass the haircuts (Benjamini-Hochberg adjusted
 * p-value below 0.05 and |NW t| above the hurdle of 3 of Harvey, Liu and Zhu 2016), the noise factors pass neither.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class DemoEvidenceEndToEndTest {
    private static final List<String> PLANTED = List.of("momentum", "quality", "investment");
    private static final List<String> NOISE = List.of("noise_alpha", "noise_beta", "noise_gamma");
    /** The series seed-data/factors.json declares with "role": "input". */
    private static final List<String> INPUTS = List.of("inflation", "risk_free");
    private static TestServer server;
    private static int definedFactors;

    @BeforeAll
    static void loadTheDemoScenario() throws IOException {
        server = new TestServer();
        Path seed = SeedDataFolder.locate();
        byte[] panel = Files.readAllBytes(seed.resolve("demo-market.csv.gz"));
        var upload = server.send(server.request("/v1/panels/demo-market/uploads", ADMIN).header("Content-Type", "text/csv")
                .header("Content-Encoding", "gzip").POST(HttpRequest.BodyPublishers.ofByteArray(panel)));
        assertEquals(202, upload.status(), upload.body());
        assertEquals("succeeded", server.awaitJob(upload.json().path("job").asText()).path("state").asText());

        JsonNode factors = new ObjectMapper().readTree(seed.resolve("factors.json").toFile());
        List<JsonNode> externalFirst = new ArrayList<>();
        factors.forEach(f -> externalFirst.add(f.has("series_file") ? 0 : externalFirst.size(), f));
        for (JsonNode f : externalFirst) {
            String name = f.get("name").asText();
            var defined = server.putJson("/v1/factors/" + name, f.get("definition").toString(), ADMIN);
            assertTrue(defined.status() == 201 || defined.status() == 202, defined.body());
            if (f.has("series_file")) {
                JsonNode job = server.upload("/v1/factors/" + name + "/uploads", Files.readString(seed.resolve(f.get("series_file").asText())));
                assertEquals("succeeded", job.path("state").asText(), job.toString());
            } else {
                assertEquals("succeeded", server.awaitJob(defined.json().path("job").asText()).path("state").asText(), name);
            }
        }
        definedFactors = factors.size();
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    @Order(1)
    void plantedFactorsPassTheHaircutsAndNoiseFactorsDoNot() {
        // every version ever built is a trial, but the two declared inputs (risk_free and inflation) are not
        JsonNode table = server.get("/v1/evidence").json();
        assertEquals(definedFactors - INPUTS.size(), table.get("trials").asInt(), table.get("excluded").toString());
        Map<String, JsonNode> rows = rows(table);
        for (String input : INPUTS) {
            assertFalse(rows.containsKey(input), input + " is an input, no trial");
            assertTrue(table.get("excluded").toString().contains("\"factor\":\"" + input + "\""), table.get("excluded").toString());
        }
        for (String name : PLANTED) {
            JsonNode row = rows.get(name);
            assertTrue(row.get("p_bh").asDouble() < 0.05, name + ": " + row);
            assertTrue(row.get("passes_t3").asBoolean(), name + ": " + row);
            assertTrue(row.get("nw_t_stat").asDouble() > 0, name + " has the planted sign");
        }
        for (String name : NOISE) {
            JsonNode row = rows.get(name);
            assertTrue(row.get("p_bh").asDouble() >= 0.05, name + ": " + row);
            assertFalse(row.get("passes_t3").asBoolean(), name + ": " + row);
        }
        // with the near-constant risk-free rate out of the trials (its huge Sharpe ratio would dominate V), the
        // deflated Sharpe ratio separates planted premia from noise
        for (String name : PLANTED) {
            assertTrue(rows.get(name).get("deflated_sharpe").asDouble() > 0.5, name + ": " + rows.get(name));
        }
        for (String name : NOISE) {
            assertTrue(rows.get(name).get("deflated_sharpe").asDouble() < 0.5, name + ": " + rows.get(name));
        }
        // risk_free=exclude is an alias kept for one release: the same table
        assertEquals(table, server.get("/v1/evidence?risk_free=exclude").json());
    }

    @Test
    @Order(2)
    void sectionVerdictsFollowThePlantedTruth() {
        JsonNode momentum = server.get("/v1/factors/momentum/evidence").json();
        assertEquals("holds", momentum.at("/significance/verdict").asText(), momentum.get("significance").toString());
        // the premium is planted for every company, so it shows in the small and in the big half
        assertEquals("holds", momentum.at("/breadth/verdict").asText(), momentum.get("breadth").toString());
        assertEquals(2, momentum.at("/breadth/same_sign").asInt());
        assertEquals("holds", momentum.at("/rationale/verdict").asText());
        assertEquals("2004-03-31", momentum.at("/stability/found_on/date").asText());
        for (String name : NOISE) {
            JsonNode noise = server.get("/v1/factors/" + name + "/evidence").json();
            assertEquals("fails", noise.at("/significance/verdict").asText(), name + ": " + noise.get("significance"));
        }
        JsonNode bySector = server.get("/v1/factors/quality/evidence?segment=sector").json().get("breadth");
        assertEquals("sector", bySector.get("segment").asText());
        assertEquals(8, bySector.get("segments").size(), "the demo has 8 sectors");
    }

    @Test
    @Order(3)
    void valueVariantsShareTheirThemeAndTheCompositeIsServed() {
        JsonNode variants = server.get("/v1/factors/value/evidence").json().get("variants");
        assertEquals(3, variants.get("members").size(), variants.toString());
        var composite = server.get("/v1/themes/value/returns");
        assertEquals(200, composite.status(), composite.body());
        assertEquals(3, composite.json().get("factors").size());
        JsonNode themes = server.get("/v1/themes").json();
        assertTrue(themes.get("declared").size() >= 9, themes.toString());
    }

    @Test
    @Order(4)
    void retiredAndRedefinedVersionsStayTrials() {
        int before = server.get("/v1/evidence").json().get("trials").asInt();
        assertEquals(204, server.delete("/v1/factors/noise_gamma", ADMIN).status());
        JsonNode afterRetire = server.get("/v1/evidence").json();
        assertEquals(before, afterRetire.get("trials").asInt());
        assertTrue(rows(afterRetire).get("noise_gamma").get("retired").asBoolean());
        var redefined = server.putJson("/v1/factors/noise_alpha", "{\"panel\":\"demo-market\",\"method\":\"sort\","
                + "\"signal\":\"noise_alpha\",\"buckets\":10,\"theme\":\"noise-check\"}", ADMIN);
        assertEquals(202, redefined.status(), redefined.body());
        server.awaitJob(redefined.json().path("job").asText());
        JsonNode afterRedefine = server.get("/v1/evidence").json();
        assertEquals(before + 1, afterRedefine.get("trials").asInt(), "every version ever built is a trial");
        long versions = 0;
        for (JsonNode row : afterRedefine.get("factors")) {
            versions += row.get("factor").asText().equals("noise_alpha") ? 1 : 0;
        }
        assertEquals(2, versions);
    }

    private static Map<String, JsonNode> rows(JsonNode table) {
        Map<String, JsonNode> rows = new HashMap<>();
        table.get("factors").forEach(r -> rows.put(r.get("factor").asText(), r));
        return rows;
    }
}
