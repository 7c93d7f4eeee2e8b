package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.app.Config;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.AfterEach;

import java.io.IOException;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Comparator;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Kills the service process (SIGKILL) in the middle of an ingest and starts it again on the same store: the
 * acknowledged upload is not lost (its job runs again), no row is applied twice, and no job stays 'running'.
 */
class CrashRecoveryEndToEndTest {
    private static final String TOKEN = "crash-test-token";
    private static final ObjectMapper JSON = new ObjectMapper();
    private final HttpClient client = HttpClient.newHttpClient();
    private Path dir;
    private TestDatabase database;
    private Process process;
    private int port;
    private String dbUrl;

    @AfterEach
    void cleanUp() throws Exception {
        if (process != null) {
            process.destroyForcibly().waitFor();
        }
        if (database != null) {
            database.close();
        }
        if (dir != null) {
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /** Kill points: right after the 202 (before the worker starts), early in the parse, late in staging. */
    @org.junit.jupiter.params.ParameterizedTest(name = "kill at progress > {0}")
    @org.junit.jupiter.params.provider.ValueSource(doubles = {-1.0, 0.05, 0.6})
    void killDuringIngestLosesNothingAndAppliesNothingTwice(double killAtProgress) throws Exception {
        dir = Files.createTempDirectory("winnow-crash");
        database = TestDatabase.fresh(dir, Config.defaultH2Url(dir));
        port = freePort();
        startService();
        assertEquals("succeeded", await(upload("date,security,return,market_cap,score\n2019-12-31,A,0.01,100,1\n")).path("state").asText());

        // 1.2 million rows: progress is reported every 65,536 rows, so even a fast ingest passes each kill point
        // with reports to spare (at 500 dates the ingest took about a second and could finish between two polls)
        int securities = 400;
        int dates = 3000;
        StringBuilder big = new StringBuilder("date,security,return,market_cap,score\n");
        java.time.LocalDate d = java.time.LocalDate.of(2020, 1, 1);
        for (int t = 0; t < dates; t++, d = d.plusDays(1)) {
            for (int s = 0; s < securities; s++) {
                big.append(d).append(",S").append(s).append(',').append(0.001 * ((s + t) % 7 - 3)).append(",100,")
                        .append((s * 31 + t) % 97).append('\n');
            }
        }
        String job = upload(big.toString());
        long deadline = System.nanoTime() + Duration.ofSeconds(60).toNanos();
        while (killAtProgress >= 0) {
            JsonNode state = get("/v1/jobs/" + job);
            if (state.path("state").asText().equals("running") && state.path("progress").asDouble() > killAtProgress) {
                break;
            }
            if (state.path("state").asText().equals("succeeded") || System.nanoTime() > deadline) {
                fail("the ingest finished or never started before it could be interrupted: " + state);
            }
            Thread.sleep(5);
        }
        process.destroyForcibly().waitFor();
        Files.move(dir.resolve("service.log"), dir.resolve("service-before-kill.log"));

        startService();
        JsonNode afterRestart = get("/v1/jobs/" + job);
        assertTrue(!afterRestart.path("state").asText().equals("failed"), afterRestart.toString());
        JsonNode finished = await(job);
        assertEquals("succeeded", finished.path("state").asText(), finished.toString());
        JsonNode panel = get("/v1/panels/crash");
        assertEquals(1 + securities * dates, panel.path("rows").asLong(), panel.toString());
        assertEquals(1 + dates, panel.path("dates").asInt(), panel.toString());
        assertEquals(1 + securities, panel.path("securities").asInt(), panel.toString());
    }

    /**
     * Issue 14: with WINNOW_DB_URL naming an H2 file the operator chose (spelled without Winnow's settings), an
     * upload answered 202 and killed at once must still be there after the restart, its job queued again.
     */
    @org.junit.jupiter.params.ParameterizedTest(name = "operator URL {0}")
    @org.junit.jupiter.params.provider.ValueSource(strings = {"jdbc:h2:file:%s/elsewhere/store", "jdbc:h2:%s/elsewhere/store;FILE_LOCK=FS"})
    void acknowledgedUploadSurvivesAKillWithAnOperatorSuppliedUrl(String urlTemplate) throws Exception {
        dir = Files.createTempDirectory("winnow-crash-url");
        port = freePort();
        org.junit.jupiter.api.Assumptions.assumeFalse(TestDatabase.onPostgres(), "operator H2 URLs are an H2 matter");
        dbUrl = String.format(urlTemplate, dir.toAbsolutePath());
        startService();
        List<String> jobs = new java.util.ArrayList<>();
        for (int i = 0; i < 5; i++) {
            jobs.add(upload("date,security,return\n2020-01-0" + (i + 1) + ",A,0.01\n"));
        }
        process.destroyForcibly().waitFor();
        Files.move(dir.resolve("service.log"), dir.resolve("service-before-kill.log"));

        startService();
        for (String job : jobs) {
            JsonNode finished = await(job);
            assertEquals("succeeded", finished.path("state").asText(), finished.toString());
        }
        assertEquals(5, get("/v1/panels/crash").path("dates").asInt());
        assertTrue(Files.exists(dir.resolve("elsewhere")), "the store is where the URL says");
    }

    private void startService() throws Exception {
        ProcessBuilder pb = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Xmx256m", "-cp", System.getProperty("java.class.path"), "dev.winnow.app.Main", "serve");
        pb.environment().put("WINNOW_PORT", String.valueOf(port));
        pb.environment().put("WINNOW_DATA_DIR", dir.toString());
        if (database != null) {
            pb.environment().put("WINNOW_DB_URL", database.url());
        }
        // on a shared store the killed process's job comes back when its lease expires; keep that short here
        pb.environment().put("WINNOW_JOB_LEASE_S", "4");
        pb.environment().put("WINNOW_ADMIN_TOKEN", TOKEN);
        if (dbUrl != null) {
            pb.environment().put("WINNOW_DB_URL", dbUrl);
        }
        pb.redirectErrorStream(true).redirectOutput(dir.resolve("service.log").toFile());
        process = pb.start();
        long deadline = System.nanoTime() + Duration.ofSeconds(60).toNanos();
        while (System.nanoTime() < deadline) {
            try {
                HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/health")).build(),
                        HttpResponse.BodyHandlers.ofString());
                if (r.statusCode() == 200) {
                    return;
                }
            } catch (IOException notYet) {
                Thread.sleep(100);
            }
        }
        fail("the service did not start: " + Files.readString(dir.resolve("service.log")));
    }

    private String upload(String csv) throws Exception {
        HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/panels/crash/uploads"))
                .header("Authorization", "Bearer " + TOKEN).header("Content-Type", "text/csv")
                .POST(HttpRequest.BodyPublishers.ofString(csv)).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(202, r.statusCode(), r.body());
        return JSON.readTree(r.body()).path("job").asText();
    }

    private JsonNode get(String path) throws Exception {
        HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path))
                .header("Authorization", "Bearer " + TOKEN).build(), HttpResponse.BodyHandlers.ofString());
        return JSON.readTree(r.body());
    }

    private JsonNode await(String job) throws Exception {
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        while (System.nanoTime() < deadline) {
            JsonNode state = get("/v1/jobs/" + job);
            String s = state.path("state").asText();
            if (s.equals("succeeded") || s.equals("failed")) {
                return state;
            }
            Thread.sleep(20);
        }
        fail("job " + job + " did not finish: " + get("/v1/jobs/" + job) + "\nservice log:\n" + Files.readString(dir.resolve("service.log")));
        return null;
    }

    private static int freePort() throws IOException {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }
}
