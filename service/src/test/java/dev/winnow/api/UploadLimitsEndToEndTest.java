package dev.winnow.api;

import dev.winnow.store.Limits;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.Socket;
import java.net.http.HttpRequest;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.zip.GZIPOutputStream;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Issue 14: an upload larger than WINNOW_MAX_UPLOAD_BYTES, as sent or once decompressed, is refused with 413 naming
 * the limit as soon as it is passed, leaving no spool file; while the data directory is short of
 * WINNOW_MIN_FREE_BYTES, or would be after the declared length, uploads are refused with 507.
 */
class UploadLimitsEndToEndTest {
    private static final long LIMIT = 10_000;
    private TestServer server;

    @AfterEach
    void stop() throws IOException {
        if (server != null) {
            server.close();
        }
    }

    private TestServer serverWith(long maxUpload, long minFree) throws IOException {
        server = new TestServer(Files.createTempDirectory("winnow-limits"), new Limits(maxUpload, minFree));
        return server;
    }

    private static String rows(int count) {
        StringBuilder csv = new StringBuilder("date,security,return\n");
        for (int i = 0; i < count; i++) {
            csv.append("2024-01-31,S").append(i).append(",0.01\n");
        }
        return csv.toString();
    }

    private void assertSpoolEmpty() throws IOException {
        Path spool = server.dataDir().resolve("spool");
        if (Files.isDirectory(spool)) {
            try (var files = Files.list(spool)) {
                assertEquals(0, files.count(), "a refused upload leaves no spool file");
            }
        }
    }

    @Test
    void aBodyPastTheLimitIs413NamingTheLimitAndLeavesNoSpoolFile() throws IOException {
        serverWith(LIMIT, 0);
        String small = rows(10);
        assertEquals("succeeded", server.upload("/v1/panels/p/uploads", small).path("state").asText());

        String big = rows(2_000);
        assertTrue(big.length() > LIMIT);
        TestServer.Reply r = server.postCsv("/v1/panels/q/uploads", big, ADMIN);
        assertProblem(r, 413);
        assertTrue(r.json().path("detail").asText().contains("WINNOW_MAX_UPLOAD_BYTES"), r.body());
        assertTrue(r.json().path("detail").asText().contains("10000 bytes"), r.body());
        assertSpoolEmpty();

        // without a Content-Length (chunked): stopped once the bytes received pass the limit
        TestServer.Reply chunked = server.send(server.request("/v1/panels/q/uploads", ADMIN).header("Content-Type", "text/csv")
                .POST(HttpRequest.BodyPublishers.ofInputStream(() -> new ByteArrayInputStream(big.getBytes(StandardCharsets.UTF_8)))));
        assertProblem(chunked, 413);
        assertSpoolEmpty();
        assertEquals(404, server.get("/v1/panels/q").status());
    }

    /**
     * A refused upload's body is read to its end before the refusal is answered, so the client reads the problem even
     * when it is still sending, and the connection stays usable. A server that answered at the headers and closed
     * would make a client still sending see a reset that can discard the answer (RFC 9112 section 9.6), and a client
     * that put the connection back in its pool would send its next request on a dead connection. On a plain socket
     * the test sends the headers and half the body, waits until the server has refused the upload at its headers (its
     * declared length is past the limit; then, a wrong media type), sends the other half, reads the problem, and sends
     * the next request on the same connection.
     */
    @Test
    void aRefusedUploadIsAnsweredAfterItsBodyAndKeepsTheConnection() throws Exception {
        serverWith(LIMIT, 0);
        byte[] body = rows(2_000).getBytes(StandardCharsets.UTF_8);
        try (Socket socket = new Socket("127.0.0.1", server.uri("/").getPort())) {
            socket.setSoTimeout(20_000);
            OutputStream out = socket.getOutputStream();
            InputStream in = socket.getInputStream();
            for (String type : List.of("text/csv", "text/plain")) {
                out.write(("POST /v1/panels/q/uploads HTTP/1.1\r\nHost: 127.0.0.1\r\nAuthorization: Bearer " + ADMIN
                        + "\r\nContent-Type: " + type + "\r\nContent-Length: " + body.length + "\r\n\r\n")
                        .getBytes(StandardCharsets.US_ASCII));
                out.write(body, 0, body.length / 2);
                out.flush();
                Thread.sleep(300); // the upload is refused at its headers; the rest of the body comes late
                out.write(body, body.length / 2, body.length - body.length / 2);
                out.flush();
                String head = readHead(in);
                assertTrue(head.startsWith("HTTP/1.1 " + (type.equals("text/csv") ? 413 : 415)), head);
                assertFalse(head.toLowerCase(java.util.Locale.ROOT).contains("connection: close"), head);
                in.readNBytes(contentLength(head));
            }
            out.write("GET /health HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n".getBytes(StandardCharsets.US_ASCII));
            out.flush();
            assertTrue(readHead(in).startsWith("HTTP/1.1 200"), "the connection still serves the next request");
        }
        assertSpoolEmpty();
    }

    /** The status line and headers of an HTTP/1.1 answer, up to the empty line. */
    private static String readHead(InputStream in) throws IOException {
        StringBuilder head = new StringBuilder();
        int b;
        while ((b = in.read()) >= 0) {
            head.append((char) b);
            if (head.length() >= 4 && head.substring(head.length() - 4).equals("\r\n\r\n")) {
                return head.toString();
            }
        }
        throw new IOException("the connection ended after " + head.length() + " bytes of the answer's head: " + head);
    }

    private static int contentLength(String head) {
        for (String line : head.split("\r\n")) {
            if (line.toLowerCase(java.util.Locale.ROOT).startsWith("content-length:")) {
                return Integer.parseInt(line.substring("content-length:".length()).trim());
            }
        }
        throw new AssertionError("no Content-Length in " + head);
    }

    @Test
    void aGzipBodyThatDecompressesPastTheLimitIs413() throws IOException {
        serverWith(LIMIT, 0);
        StringBuilder repeated = new StringBuilder("date,security,return\n");
        while (repeated.length() < 20 * LIMIT) {
            repeated.append("2024-01-31,SAME,0.01\n");
        }
        ByteArrayOutputStream zipped = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(zipped)) {
            gz.write(repeated.toString().getBytes(StandardCharsets.UTF_8));
        }
        assertTrue(zipped.size() < LIMIT, "the compressed body is under the limit: " + zipped.size());
        TestServer.Reply r = server.send(server.request("/v1/panels/g/uploads", ADMIN).header("Content-Type", "text/csv")
                .header("Content-Encoding", "gzip").POST(HttpRequest.BodyPublishers.ofByteArray(zipped.toByteArray())));
        assertProblem(r, 413);
        assertTrue(r.json().path("detail").asText().contains("decompressed"), r.body());
        assertSpoolEmpty();
    }

    @Test
    void aDeclaredLengthPastTheLimitIsRefusedBeforeTheBodyIsRead() throws IOException {
        serverWith(LIMIT, 0);
        RawHttp.Answer a = RawHttp.send(server.winnow().port(), "POST /v1/panels/d/uploads HTTP/1.1\r\nHost: x\r\n"
                + "Authorization: Bearer " + ADMIN + "\r\nContent-Type: text/csv\r\nContent-Length: 3221225472", "date,".getBytes(StandardCharsets.UTF_8));
        assertEquals(413, a.status(), a.body());
        assertTrue(a.header("Content-Type").startsWith("application/problem+json"), a.headers().toString());
        assertTrue(a.body().contains("WINNOW_MAX_UPLOAD_BYTES"), a.body());
        assertSpoolEmpty();
    }

    @Test
    void aSpoolThatCannotBeWrittenIs507NotA500() throws IOException {
        serverWith(Limits.DEFAULTS.maxUploadBytes(), 0);
        Path spool = server.dataDir().resolve("spool");
        if (Files.isDirectory(spool)) {
            Files.delete(spool);
        }
        Files.writeString(spool, "a file where the spool directory should be"); // unwritable even for root
        TestServer.Reply r = server.postCsv("/v1/panels/nowhere/uploads", rows(3), ADMIN);
        assertProblem(r, 507);
        assertTrue(!r.body().contains(server.dataDir().toString()), "no internal paths: " + r.body());
        Files.delete(spool);
        assertEquals("succeeded", server.upload("/v1/panels/nowhere/uploads", rows(3)).path("state").asText());
    }

    @Test
    void uploadsAre507WhileFreeSpaceIsBelowTheFloor() throws IOException {
        serverWith(Limits.DEFAULTS.maxUploadBytes(), Long.MAX_VALUE / 4);
        TestServer.Reply r = server.postCsv("/v1/panels/full/uploads", rows(3), ADMIN);
        assertProblem(r, 507);
        assertTrue(r.json().path("detail").asText().contains("WINNOW_MIN_FREE_BYTES"), r.body());
        assertSpoolEmpty();
        assertEquals("degraded", server.get("/health").json().path("status").asText());
        assertEquals("low_space", server.get("/health").json().path("store").asText());
    }

    @Test
    void uploadsAre507WhenTheDeclaredLengthWouldTakeFreeSpaceBelowTheFloor() throws IOException {
        Path probe = Files.createTempDirectory("winnow-free");
        long free = Files.getFileStore(probe).getUsableSpace();
        Files.delete(probe);
        long floor = Math.max(0, free - (256L << 20));
        serverWith(Limits.DEFAULTS.maxUploadBytes(), floor);
        assertEquals("succeeded", server.upload("/v1/panels/ok/uploads", rows(3)).path("state").asText(), "a small upload still fits");
        RawHttp.Answer a = RawHttp.send(server.winnow().port(), "POST /v1/panels/big/uploads HTTP/1.1\r\nHost: x\r\n"
                + "Authorization: Bearer " + ADMIN + "\r\nContent-Type: text/csv\r\nContent-Length: " + (1L << 30), "date,".getBytes(StandardCharsets.UTF_8));
        assertEquals(507, a.status(), a.body());
        assertTrue(a.body().contains("WINNOW_MIN_FREE_BYTES"), a.body());
        assertSpoolEmpty();
    }
}
