package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.store.Limits;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.net.http.HttpRequest;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.LocalDate;
import java.util.zip.GZIPOutputStream;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Issue 14: the data directory on a small file system (a tmpfs mounted for the test; skipped with a message where
 * the test may not mount one). An ingest that fills the disk fails cleanly: its error says the disk is full, nothing
 * of it is visible, /health answers 503 while the store cannot be used, and once space is freed the worker records
 * the failure, /health is 200 again and the next upload succeeds.
 */
class FullDiskEndToEndTest {
    private static final long SIZE = 48L << 20;
    private Path mount;
    private boolean mounted;
    private TestServer server;

    @AfterEach
    void cleanUp() throws Exception {
        if (server != null) {
            server.close();
        }
        if (mounted) {
            run("umount", mount.toString());
        }
        if (mount != null) {
            Files.deleteIfExists(mount);
        }
    }

    @Test
    void anIngestThatFillsTheDiskFailsCleanlyAndTheWorkerCarriesOnOnceSpaceIsBack() throws Exception {
        Assumptions.assumeFalse(dev.winnow.store.TestDatabase.onPostgres(), "full-disk test skipped: the store is on PostgreSQL, not in the data directory");
        mount = Files.createTempDirectory("winnow-fulldisk");
        String why = mountSmallFileSystem();
        Assumptions.assumeTrue(why == null, "full-disk test skipped: " + why);
        server = new TestServer(mount.resolve("data"), new Limits(Limits.DEFAULTS.maxUploadBytes(), 0));
        assertEquals("succeeded", server.upload("/v1/panels/before/uploads", panel(2, 3, LocalDate.of(2020, 1, 1))).path("state").asText());

        byte[] body = gzip(panel(400, 600, LocalDate.of(2000, 1, 3)));
        Path filler = mount.resolve("filler");
        long leave = body.length + (3L << 20);
        fill(filler, Files.getFileStore(mount).getUsableSpace() - leave);

        TestServer.Reply accepted = server.send(server.request("/v1/panels/big/uploads", ADMIN).header("Content-Type", "text/csv")
                .header("Content-Encoding", "gzip").POST(HttpRequest.BodyPublishers.ofByteArray(body)));
        assertEquals(202, accepted.status(), accepted.body());
        String job = accepted.json().path("job").asText();

        // either the worker records the failure at once, or it waits for the store and /health says so
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        boolean sawUnavailable = false;
        while (true) {
            TestServer.Reply health = server.get("/health", null);
            if (health.status() == 503) {
                assertEquals("unavailable", health.json().path("status").asText(), health.body());
                sawUnavailable = true;
                break;
            }
            TestServer.Reply state = server.get("/v1/jobs/" + job);
            assertNotEquals(500, state.status(), state.body());
            if (state.status() == 200 && state.json().path("state").asText().equals("failed")) {
                break;
            }
            if (state.status() == 200 && state.json().path("state").asText().equals("succeeded")) {
                fail("the upload fitted on the disk; the test must fill it: " + state.body());
            }
            if (System.nanoTime() > deadline) {
                fail("the job neither failed nor made /health report the store: " + state.body() + " " + health.body());
            }
            Thread.sleep(50);
        }

        Files.delete(filler);
        JsonNode failed = server.awaitJob(job);
        assertEquals("failed", failed.path("state").asText(), failed.toString());
        String error = failed.path("errors").get(0).path("message").asText();
        assertTrue(error.contains("disk") && error.contains("full"), error);
        assertTrue(!error.contains("SELECT") && !error.contains("INSERT") && !error.contains(mount.toString()), error);

        JsonNode health = awaitHealthy();
        assertEquals("ok", health.path("store").asText(), health.toString());
        assertEquals(404, server.get("/v1/panels/big").status(), "nothing of the failed upload is visible");
        assertEquals("succeeded", server.upload("/v1/panels/after/uploads", panel(2, 3, LocalDate.of(2021, 1, 1))).path("state").asText());
        assertEquals(3, server.get("/v1/panels/before").json().path("dates").asInt());
        if (!sawUnavailable) {
            System.out.println("full-disk test: the worker recorded the failure without waiting for the store");
        }
    }

    private JsonNode awaitHealthy() throws InterruptedException {
        long deadline = System.nanoTime() + Duration.ofSeconds(60).toNanos();
        TestServer.Reply health;
        do {
            health = server.get("/health", null);
            if (health.status() == 200 && health.json().path("status").asText().equals("ok")) {
                return health.json();
            }
            Thread.sleep(100);
        } while (System.nanoTime() < deadline);
        fail("/health did not recover: " + health.body());
        return null;
    }

    private String mountSmallFileSystem() throws Exception {
        if (!System.getProperty("os.name").toLowerCase().contains("linux")) {
            return "needs Linux to mount a tmpfs";
        }
        String out = run("mount", "-t", "tmpfs", "-o", "size=" + SIZE, "tmpfs", mount.toString());
        if (out != null) {
            return "could not mount a " + (SIZE >> 20) + " MB tmpfs (needs root or CAP_SYS_ADMIN): " + out;
        }
        mounted = true;
        return null;
    }

    /** Runs a command; null when it succeeded, else its output. */
    private static String run(String... command) throws Exception {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
            return p.waitFor() == 0 ? null : out.strip();
        } catch (IOException e) {
            return e.getMessage();
        }
    }

    private static void fill(Path file, long bytes) throws IOException {
        byte[] block = new byte[1 << 20];
        try (OutputStream out = Files.newOutputStream(file)) {
            for (long left = Math.max(0, bytes); left > 0; left -= block.length) {
                out.write(block, 0, (int) Math.min(block.length, left));
            }
        }
    }

    private static String panel(int securities, int dates, LocalDate first) {
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,a,b,c\n");
        LocalDate d = first;
        for (int t = 0; t < dates; t++, d = d.plusDays(1)) {
            for (int s = 0; s < securities; s++) {
                csv.append(d).append(",S").append(s).append(',').append(0.001 * ((s * 7 + t) % 13 - 6))
                        .append(',').append(100 + s).append(',').append((s * 31 + t) % 97 * 0.37)
                        .append(',').append(Math.sin(s + t)).append(',').append(Math.cos(s * t)).append('\n');
            }
        }
        return csv.toString();
    }

    private static byte[] gzip(String text) throws IOException {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(bytes)) {
            gz.write(text.getBytes(StandardCharsets.UTF_8));
        }
        return bytes.toByteArray();
    }
}
