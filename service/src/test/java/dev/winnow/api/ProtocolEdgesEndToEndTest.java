package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.http.HttpRequest;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Issue 14, low findings: answers the web server gave as HTML pages, broken escapes, duplicate JSON keys, loose
 * content types, spool files left behind, and a start on a read-only data directory.
 */
class ProtocolEdgesEndToEndTest {
    private static final ObjectMapper JSON = new ObjectMapper();
    private static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    private static RawHttp.Answer raw(String requestLine, String extraHeaders) throws IOException {
        return RawHttp.send(server.winnow().port(), requestLine + "\r\nHost: x\r\nAuthorization: Bearer " + ADMIN
                + (extraHeaders.isEmpty() ? "" : "\r\n" + extraHeaders), null);
    }

    private static void assertRawProblem(RawHttp.Answer a, int status) throws IOException {
        assertEquals(status, a.status(), a.body());
        assertTrue(a.header("Content-Type") != null && a.header("Content-Type").startsWith("application/problem+json"),
                "expected problem+json, got " + a.header("Content-Type") + ": " + a.body());
        JsonNode body = JSON.readTree(a.body());
        assertEquals(status, body.path("status").asInt(), a.body());
        assertTrue(!body.path("detail").asText().isBlank(), a.body());
    }

    @Test
    void aTenThousandCharacterPathIs414ProblemJson() throws IOException {
        assertRawProblem(raw("GET /v1/factors/" + "a".repeat(10_000) + " HTTP/1.1", ""), 414);
    }

    @Test
    void aTenThousandCharacterHeaderIs431ProblemJson() throws IOException {
        assertRawProblem(raw("GET /v1/factors HTTP/1.1", "X-Long: " + "b".repeat(10_000)), 431);
    }

    @Test
    void aNulOrABrokenEscapeInThePathIs400ProblemJson() throws IOException {
        assertRawProblem(raw("GET /v1/factors/a%00b HTTP/1.1", ""), 400);
        assertRawProblem(raw("GET /v1/factors/%ZZ HTTP/1.1", ""), 400);
    }

    @Test
    void aBrokenEscapeInAQueryParameterIs400() throws IOException {
        assertRawProblem(raw("GET /v1/factors?include=%ZZ HTTP/1.1", ""), 400);
        RawHttp.Answer a = raw("GET /v1/factors/anything/returns?to=%ZZ HTTP/1.1", "");
        assertRawProblem(a, 400);
        assertTrue(a.body().contains("percent escape"), a.body());
        assertEquals(200, raw("GET /v1/factors?include=%72etired HTTP/1.1", "").status(), "a good escape still works");
    }

    @Test
    void duplicateKeysInAJsonBodyAre400() {
        TestServer.Reply r = server.postJson("/v1/tokens", "{\"name\":\"dup\",\"scope\":\"read\",\"scope\":\"admin\"}", ADMIN);
        assertProblem(r, 400);
        assertTrue(r.body().contains("scope"), r.body());
        assertEquals(404, server.delete("/v1/tokens/dup", ADMIN).status(), "no token was made");
    }

    @Test
    void jsonAsTextPlainAndCsvAsTextCsvfooAre415() {
        TestServer.Reply plain = server.send(server.request("/v1/tokens", ADMIN).header("Content-Type", "text/plain")
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"plain\",\"scope\":\"read\"}")));
        assertProblem(plain, 415);
        TestServer.Reply csvfoo = server.send(server.request("/v1/panels/p/uploads", ADMIN).header("Content-Type", "text/csvfoo")
                .POST(HttpRequest.BodyPublishers.ofString("date,security,return\n2024-01-31,A,0.01\n")));
        assertProblem(csvfoo, 415);
        TestServer.Reply withCharset = server.send(server.request("/v1/tokens", ADMIN).header("Content-Type", "application/json; charset=utf-8")
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"charset\",\"scope\":\"read\"}")));
        assertEquals(201, withCharset.status(), withCharset.body());
    }

    @Test
    void theSpoolFileOfAFailedUploadIsRemovedWhenItsJobEnds() throws IOException {
        JsonNode job = server.upload("/v1/panels/bad/uploads", "date,security,return\n2024-01-31,A,lots\n");
        assertEquals("failed", job.path("state").asText());
        JsonNode done = server.upload("/v1/panels/good/uploads", "date,security,return\n2024-01-31,A,0.01\n");
        assertEquals("succeeded", done.path("state").asText());
        Path spool = server.dataDir().resolve("spool");
        if (Files.isDirectory(spool)) {
            try (var files = Files.list(spool)) {
                assertEquals(0, files.count(), "spool files of ended jobs are removed");
            }
        }
    }

    @Test
    void startingOnAReadOnlyDataDirectoryPrintsOneLineAndExits1() throws Exception {
        Path dir = Files.createTempDirectory("winnow-readonly");
        Process mount = new ProcessBuilder("mount", "-t", "tmpfs", "-o", "ro,size=1m", "tmpfs", dir.toString())
                .redirectErrorStream(true).start();
        boolean mounted = mount.waitFor() == 0;
        try {
            Assumptions.assumeTrue(mounted, "read-only data directory test skipped: could not mount a read-only tmpfs "
                    + "(needs root or CAP_SYS_ADMIN)");
            ProcessBuilder pb = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                    "-cp", System.getProperty("java.class.path"), "dev.winnow.app.Main", "serve");
            pb.environment().put("WINNOW_DATA_DIR", dir.resolve("data").toString());
            pb.environment().put("WINNOW_PORT", "0");
            pb.environment().remove("WINNOW_DB_URL");
            pb.redirectErrorStream(true);
            Process p = pb.start();
            assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the service stops at once");
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).strip();
            assertEquals(1, p.exitValue(), out);
            assertEquals(1, out.lines().count(), "one line, no stack trace: " + out);
            assertTrue(out.startsWith("winnow: cannot write to the data directory " + dir.resolve("data")), out);
        } finally {
            if (mounted) {
                new ProcessBuilder("umount", dir.toString()).start().waitFor();
            }
            Files.deleteIfExists(dir);
        }
    }
}
