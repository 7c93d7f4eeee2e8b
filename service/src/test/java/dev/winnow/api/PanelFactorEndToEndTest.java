package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.http.HttpRequest;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Upload, job, define, series as JSON and CSV, ETag/304, appends, versions: the whole path over HTTP. */
class PanelFactorEndToEndTest {
    TestServer server;

    @BeforeEach
    void start() throws IOException {
        server = new TestServer();
    }

    @AfterEach
    void stop() throws IOException {
        server.close();
    }

    /**
     * Four securities over three month-ends. Worked by hand for a 2-bucket equal-weighted sort on "score", lag 1:
     * formation 2020-01-31: scores A=1, B=2, C=3, D=4; type-7 median of {1,2,3,4} = 2.5, so bucket 1 = {A,B}, bucket 2 = {C,D}.
     * Period 2020-02-29 returns: A=0.01, B=0.03, C=0.05, D=0.02 -> long (C,D) 0.035, short (A,B) 0.02, spread 0.015.
     * Formation 2020-02-29: scores A=4, B=3, C=2, D=1 -> long {A,B}, short {C,D}.
     * Period 2020-03-31 returns: A=-0.02, B=0.00, C=0.04, D=0.06 -> long -0.01, short 0.05, spread -0.06.
     */
    static final String PANEL = """
            date,security,return,market_cap,score,sector
            2020-01-31,A,0.00,100,1,north
            2020-01-31,B,0.00,200,2,north
            2020-01-31,C,0.00,300,3,south
            2020-01-31,D,0.00,400,4,south
            2020-02-29,A,0.01,100,4,north
            2020-02-29,B,0.03,200,3,north
            2020-02-29,C,0.05,300,2,south
            2020-02-29,D,0.02,400,1,south
            2020-03-31,A,-0.02,100,1,north
            2020-03-31,B,0.00,200,2,north
            2020-03-31,C,0.04,300,3,south
            2020-03-31,D,0.06,400,4,south
            """;

    static final String DEFINITION = "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":2,\"theme\":\"test\","
            + "\"rationale\":\"hand-worked example\"}";

    @Test
    void uploadDefineAndReadASortedFactor() {
        JsonNode job = server.upload("/v1/panels/acme/uploads", PANEL);
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        assertEquals(12, job.path("rows_read").asLong());
        assertEquals(12, job.path("rows_accepted").asLong());
        assertEquals(1.0, job.path("progress").asDouble());

        JsonNode panel = server.get("/v1/panels/acme").json();
        assertEquals("2020-01-31", panel.path("first_date").asText());
        assertEquals("2020-03-31", panel.path("last_date").asText());
        assertEquals(3, panel.path("dates").asInt());
        assertEquals(4, panel.path("securities").asInt());
        assertEquals(12, panel.path("rows").asInt());
        assertEquals("monthly", panel.path("frequency").asText());
        assertTrue(panel.path("columns").toString().contains("{\"name\":\"score\",\"type\":\"number\"}"), panel.toString());
        assertTrue(panel.path("columns").toString().contains("{\"name\":\"sector\",\"type\":\"label\"}"), panel.toString());

        var put = server.putJson("/v1/factors/tilt", DEFINITION, ADMIN);
        assertEquals(202, put.status(), put.body());
        assertEquals("succeeded", server.awaitJob(put.json().path("job").asText()).path("state").asText());

        JsonNode factor = server.get("/v1/factors/tilt").json();
        assertEquals("ready", factor.path("status").asText());
        assertEquals(1, factor.path("version").asInt());
        assertEquals(2, factor.path("observations").asInt());

        JsonNode series = server.get("/v1/factors/tilt/returns").json();
        assertEquals("[\"2020-02-29\",\"2020-03-31\"]", series.path("dates").toString());
        assertEquals(0.015, series.path("returns").get(0).asDouble(), 1e-15);
        assertEquals(-0.06, series.path("returns").get(1).asDouble(), 1e-15);
        JsonNode longLeg = server.get("/v1/factors/tilt/returns?leg=long").json();
        assertEquals(0.035, longLeg.path("returns").get(0).asDouble(), 1e-15);
        JsonNode shortLeg = server.get("/v1/factors/tilt/returns?leg=short").json();
        assertEquals(0.05, shortLeg.path("returns").get(1).asDouble(), 1e-15);

        var csv = server.get("/v1/factors/tilt/returns?format=csv");
        assertEquals(200, csv.status());
        assertTrue(csv.header("Content-Type").startsWith("text/csv"));
        String[] lines = csv.body().split("\n");
        assertEquals("date,return", lines[0]);
        assertEquals("2020-02-29", lines[1].split(",")[0]);
        assertEquals(0.015, Double.parseDouble(lines[1].split(",")[1]), 1e-15);
        var accept = server.send(server.request("/v1/factors/tilt/returns", ADMIN).header("Accept", "text/csv").GET());
        assertEquals(csv.body(), accept.body());

        String etag = server.get("/v1/factors/tilt/returns").header("ETag");
        assertTrue(etag != null && etag.startsWith("\""), etag);
        var notModified = server.send(server.request("/v1/factors/tilt/returns", ADMIN).header("If-None-Match", etag).GET());
        assertEquals(304, notModified.status());
        assertEquals("", notModified.body());

        // an append extends the factor and changes its ETag
        JsonNode append = server.upload("/v1/panels/acme/uploads", """
                date,security,return,market_cap,score,sector
                2020-04-30,A,0.10,100,1,north
                2020-04-30,B,0.00,200,2,north
                2020-04-30,C,0.00,300,3,south
                2020-04-30,D,0.02,400,4,south
                """);
        assertEquals("succeeded", append.path("state").asText(), append.toString());
        assertEquals("extended", append.path("report").path("factors").get(0).path("action").asText(), append.toString());
        var afterAppend = server.send(server.request("/v1/factors/tilt/returns", ADMIN).header("If-None-Match", etag).GET());
        assertEquals(200, afterAppend.status());
        assertNotEquals(etag, afterAppend.header("ETag"));
        // formation 2020-03-31: long {C,D}, short {A,B}; April: long (0+0.02)/2 = 0.01, short (0.10+0)/2 = 0.05 -> -0.04
        JsonNode extended = afterAppend.json();
        assertEquals(3, extended.path("returns").size());
        assertEquals(-0.04, extended.path("returns").get(2).asDouble(), 1e-15);

        // the same definition is no new version; a changed one is, and version 1 stays readable
        assertEquals(200, server.putJson("/v1/factors/tilt", DEFINITION, ADMIN).status());
        var v2 = server.putJson("/v1/factors/tilt", DEFINITION.replace("\"buckets\":2", "\"buckets\":2,\"direction\":\"low_minus_high\""), ADMIN);
        assertEquals(202, v2.status(), v2.body());
        assertEquals(2, v2.json().path("version").asInt());
        server.awaitJob(v2.json().path("job").asText());
        assertEquals(-0.015, server.get("/v1/factors/tilt/returns").json().path("returns").get(0).asDouble(), 1e-15);
        assertEquals(0.015, server.get("/v1/factors/tilt/returns?version=1").json().path("returns").get(0).asDouble(), 1e-15);
        assertProblem(server.get("/v1/factors/tilt/returns?version=9"), 404);
        assertProblem(server.get("/v1/factors/tilt?version=9"), 404);

        // retire: gone from the list unless asked, series kept
        assertEquals(204, server.delete("/v1/factors/tilt", ADMIN).status());
        assertFalse(server.get("/v1/factors").body().contains("\"tilt\""));
        assertTrue(server.get("/v1/factors?include=retired").body().contains("\"tilt\""));
        assertEquals(200, server.get("/v1/factors/tilt/returns").status());
    }

    @Test
    void gzipUploadsAreAccepted() {
        var r = server.postCsvGzip("/v1/panels/zipped/uploads", PANEL, ADMIN);
        assertEquals(202, r.status(), r.body());
        assertEquals("/v1/jobs/" + r.json().path("job").asText(), r.header("Location"));
        assertEquals("succeeded", server.awaitJob(r.json().path("job").asText()).path("state").asText());
        assertEquals(12, server.get("/v1/panels/zipped").json().path("rows").asInt());
    }

    @Test
    void badDefinitionsAre400AtOnce() {
        server.upload("/v1/panels/acme/uploads", PANEL);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"nope\",\"method\":\"sort\",\"signal\":\"score\"}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"missing\"}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"sector\"}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"score\",\"colour\":1}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":1}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"score\",\"lag\":0}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{\"panel\":\"acme\",\"method\":\"teleport\"}", ADMIN), 400);
        assertProblem(server.putJson("/v1/factors/x", "{", ADMIN), 400);
        assertProblem(server.get("/v1/factors/x"), 404);
        assertProblem(server.get("/v1/factors/x/returns"), 404);
    }

    @Test
    void badSeriesQueriesAre400() {
        server.upload("/v1/panels/acme/uploads", PANEL);
        server.awaitJob(server.putJson("/v1/factors/tilt", DEFINITION, ADMIN).json().path("job").asText());
        assertProblem(server.get("/v1/factors/tilt/returns?from=2020-13-01"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?from=2020-03-01&to=2020-01-01"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?leg=middle"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?frequency=hourly"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?frequency=daily"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?format=xml"), 400);
        assertProblem(server.get("/v1/factors/tilt/returns?version=0"), 400);
    }

    @Test
    void externalSeriesUploadAndRevision() {
        assertEquals(201, server.putJson("/v1/factors/rf", "{\"method\":\"external\",\"theme\":\"rates\",\"rationale\":\"cash\"}", ADMIN).status());
        JsonNode job = server.upload("/v1/factors/rf/uploads", "date,return\n2020-01-31,0.001\n2020-02-29,0.002\n");
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        JsonNode overlap = server.upload("/v1/factors/rf/uploads", "date,return\n2020-02-29,0.003\n");
        assertEquals("failed", overlap.path("state").asText());
        var revise = server.send(server.request("/v1/factors/rf/uploads?mode=revise", ADMIN).header("Content-Type", "text/csv")
                .POST(HttpRequest.BodyPublishers.ofString("date,return\n2020-02-29,0.003\n")));
        assertEquals("succeeded", server.awaitJob(revise.json().path("job").asText()).path("state").asText());
        JsonNode series = server.get("/v1/factors/rf/returns").json();
        assertEquals("[0.001,0.003]", series.path("returns").toString());
        server.upload("/v1/panels/acme/uploads", PANEL);
        assertProblem(server.postCsv("/v1/factors/nothing/uploads", "date,return\n", ADMIN), 404);
        server.awaitJob(server.putJson("/v1/factors/tilt", DEFINITION, ADMIN).json().path("job").asText());
        assertProblem(server.postCsv("/v1/factors/tilt/uploads", "date,return\n2020-01-31,0.1\n", ADMIN), 409);
    }
}
