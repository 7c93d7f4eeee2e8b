package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.util.stream.Stream;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Every bad upload fails whole, names line and column, and leaves the panel exactly as it was. */
class UploadRejectionEndToEndTest {
    static TestServer server;
    static final String HEADER = "date,security,return,market_cap,score,sector\n";

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        JsonNode job = server.upload("/v1/panels/base/uploads", HEADER
                + "2020-01-31,A,0.01,100,1,north\n"
                + "2020-01-31,B,0.02,200,2,south\n");
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    static Stream<Arguments> badUploads() {
        return Stream.of(
                Arguments.of("missing required column", "date,security,market_cap\n2020-02-28,A,100\n", 1, "return"),
                Arguments.of("unparseable date", HEADER + "2020-02-28,A,0.01,100,1,north\n2020-02-30,B,0.01,100,1,north\n", 3, "date"),
                Arguments.of("text in a numeric column", HEADER + "2020-02-28,A,abc,100,1,north\n", 2, "return"),
                Arguments.of("return below -1", HEADER + "2020-02-28,A,-1.5,100,1,north\n", 2, "return"),
                Arguments.of("market cap of zero", HEADER + "2020-02-28,A,0.01,0,1,north\n", 2, "market_cap"),
                Arguments.of("negative market cap", HEADER + "2020-02-28,A,0.01,-5,1,north\n", 2, "market_cap"),
                Arguments.of("NaN", HEADER + "2020-02-28,A,0.01,100,NaN,north\n", 2, "score"),
                Arguments.of("infinity", HEADER + "2020-02-28,A,Infinity,100,1,north\n", 2, "return"),
                Arguments.of("duplicate (date, security)", HEADER + "2020-02-28,A,0.01,100,1,north\n2020-02-28,A,0.02,100,1,north\n", 3, null),
                Arguments.of("column type changed", HEADER + "2020-02-28,A,0.01,100,high,north\n", 2, "score"),
                Arguments.of("overlapping date on append", HEADER + "2020-01-31,C,0.01,100,1,north\n", 2, "date"),
                Arguments.of("wrong number of fields", HEADER + "2020-02-28,A,0.01,100\n", 2, null),
                Arguments.of("header only", HEADER, 2, null));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badUploads")
    void badUploadFailsWithLineAndColumnAndChangesNothing(String what, String csv, long line, String column) {
        JsonNode before = server.get("/v1/panels/base").json();
        JsonNode job = server.upload("/v1/panels/base/uploads", csv);
        assertEquals("failed", job.path("state").asText(), what + ": " + job);
        JsonNode errors = job.path("errors");
        assertTrue(errors.size() >= 1, what + ": " + job);
        JsonNode first = errors.get(0);
        assertEquals(line, first.path("line").asLong(), what + ": " + errors);
        if (column != null) {
            assertEquals(column, first.path("column").asText(), what + ": " + errors);
        }
        assertTrue(first.path("message").asText().length() > 10, what + ": " + errors);
        assertEquals(before, server.get("/v1/panels/base").json(), what + ": the panel changed");
    }

    @Test
    void emptyBodyAndWrongContentTypeAreRejectedAtOnce() {
        assertProblem(server.postCsv("/v1/panels/base/uploads", "", ADMIN), 400);
        var wrongType = server.send(server.request("/v1/panels/base/uploads", ADMIN).header("Content-Type", "application/json")
                .POST(java.net.http.HttpRequest.BodyPublishers.ofString("{}")));
        assertProblem(wrongType, 415);
        assertProblem(server.postCsv("/v1/panels/bad%20name/uploads", HEADER, ADMIN), 400);
        assertProblem(server.postCsv("/v1/panels/base/uploads?mode=replace", HEADER, ADMIN), 400);
        assertProblem(server.postCsv("/v1/panels/never-uploaded/uploads?mode=revise", HEADER, ADMIN), 404);
    }

    @Test
    void aFailedFirstUploadLeavesNoPanel() {
        JsonNode job = server.upload("/v1/panels/ghost/uploads", HEADER + "2020-02-28,A,oops,100,1,north\n");
        assertEquals("failed", job.path("state").asText());
        assertProblem(server.get("/v1/panels/ghost"), 404);
        assertTrue(!server.get("/v1/panels").body().contains("ghost"));
    }

    @Test
    void moreThanAHundredErrorsAreCappedAndCounted() {
        StringBuilder csv = new StringBuilder(HEADER);
        for (int i = 0; i < 150; i++) {
            csv.append("2020-03-31,S").append(i).append(",bad,100,1,north\n");
        }
        JsonNode job = server.upload("/v1/panels/base/uploads", csv.toString());
        assertEquals("failed", job.path("state").asText());
        assertEquals(150, job.path("rows_rejected").asLong(), job.toString());
        assertTrue(job.path("errors").size() <= 101, job.path("errors").size() + " errors listed");
    }
}
