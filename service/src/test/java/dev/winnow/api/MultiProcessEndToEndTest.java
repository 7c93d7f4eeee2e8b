package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.app.Config;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.time.Duration;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * Three processes on one PostgreSQL store (one API instance, two worker instances, each a child JVM): uploads to
 * two panels and factors built on both; the worker running the large ingest is killed with SIGKILL in the middle of
 * it. The other worker claims the job when its lease expires and finishes it; every job ends succeeded, with its
 * upload committed once; nothing stays running; and every series the API instance serves equals, bit for bit, the
 * same uploads and definitions run by a single process.
 */
class MultiProcessEndToEndTest {
    private static final String TOKEN = "multi-process-token";
    private static final ObjectMapper JSON = new ObjectMapper();
    private final HttpClient client = HttpClient.newHttpClient();
    private final List<Process> processes = new ArrayList<>();
    private final List<Path> dirs = new ArrayList<>();
    private TestDatabase database;

    @AfterEach
    void cleanUp() throws Exception {
        for (Process p : processes) {
            p.destroyForcibly().waitFor();
        }
        if (database != null) {
            database.close();
        }
        for (Path dir : dirs) {
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    private record Instance(Process process, int port, Path log) {
    }

    private Instance start(String role) throws Exception {
        Path dir = Files.createTempDirectory("winnow-multi-" + role);
        dirs.add(dir);
        int port = freePort();
        ProcessBuilder pb = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Xmx256m", "-cp", System.getProperty("java.class.path"), "dev.winnow.app.Main", "serve");
        pb.environment().put("WINNOW_ROLE", role);
        pb.environment().put("WINNOW_PORT", String.valueOf(port));
        pb.environment().put("WINNOW_DATA_DIR", dir.toString());
        pb.environment().put("WINNOW_DB_URL", database.url());
        pb.environment().put("WINNOW_ADMIN_TOKEN", TOKEN);
        pb.environment().put("WINNOW_JOB_LEASE_S", "4");
        pb.environment().put("WINNOW_DB_POOL", "4");
        Path log = dir.resolve("service.log");
        pb.redirectErrorStream(true).redirectOutput(log.toFile());
        Process process = pb.start();
        processes.add(process);
        long deadline = System.nanoTime() + Duration.ofSeconds(90).toNanos();
        while (System.nanoTime() < deadline) {
            try {
                if (client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/health")).build(),
                        HttpResponse.BodyHandlers.discarding()).statusCode() == 200) {
                    return new Instance(process, port, log);
                }
            } catch (IOException notYet) {
                Thread.sleep(100);
            }
        }
        fail("the " + role + " instance did not start: " + Files.readString(log));
        return null;
    }

    /** Panel rows: {@code securities} securities over weekdays from {@code from}, {@code days} of them. */
    static String panel(LocalDate from, int days, int securities, int seed) {
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score\n");
        LocalDate d = from;
        for (int t = 0; t < days; d = d.plusDays(1)) {
            if (d.getDayOfWeek().getValue() > 5) {
                continue;
            }
            for (int s = 0; s < securities; s++) {
                csv.append(d).append(",S").append(s).append(',').append(0.0001 * (((s * 31 + t * 7 + seed) % 41) - 20))
                        .append(',').append(50 + (s * 13 + seed) % 500).append(',').append((s * 17 + t + seed) % 97).append('\n');
            }
            t++;
        }
        return csv.toString();
    }

    private static final LocalDate START = LocalDate.of(2021, 1, 4);
    private static final LocalDate LATER = LocalDate.of(2021, 3, 1);

    /** The definitions, by factor name. */
    private static final Map<String, String> FACTORS = new LinkedHashMap<>();

    static {
        FACTORS.put("alpha_score", "{\"panel\":\"alpha\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":3,\"weighting\":\"cap\",\"theme\":\"t\",\"rationale\":\"r\"}");
        FACTORS.put("beta_score", "{\"panel\":\"beta\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":5,\"rebalance\":\"every_period\",\"cost_bps\":10,\"theme\":\"t\",\"rationale\":\"r\"}");
        FACTORS.put("beta_market", "{\"panel\":\"beta\",\"method\":\"market\",\"theme\":\"t\",\"rationale\":\"r\"}");
    }

    @Test
    void aKilledWorkersJobIsFinishedOnceByTheOtherAndEverySeriesMatchesOneProcess() throws Exception {
        assumeTrue(TestDatabase.onPostgres(), "several processes share a store only on PostgreSQL (WINNOW_TEST_DB_URL)");
        Path dir = Files.createTempDirectory("winnow-multi");
        dirs.add(dir);
        database = TestDatabase.fresh(dir, Config.defaultH2Url(dir));
        Instance api = start("api");
        Instance w1 = start("worker");
        Instance w2 = start("worker");

        String alphaLarge = panel(LATER, 120, 150, 3);
        // about a million rows: the one-pass ingest parses 160,000 rows in a third of a second, too fast to be killed
        int betaLargeDays = 2400;
        String betaLarge = panel(LATER, betaLargeDays, 400, 4);
        List<String> jobs = new ArrayList<>();
        jobs.add(await(api, upload(api, "alpha", panel(START, 30, 150, 1))));
        jobs.add(await(api, upload(api, "beta", panel(START, 30, 400, 2))));
        for (Map.Entry<String, String> f : FACTORS.entrySet()) {
            HttpResponse<String> r = send(api, HttpRequest.newBuilder(uri(api, "/v1/factors/" + f.getKey()))
                    .header("Content-Type", "application/json").PUT(HttpRequest.BodyPublishers.ofString(f.getValue())));
            assertEquals(202, r.statusCode(), r.body());
            jobs.add(JSON.readTree(r.body()).path("job").asText());
        }
        String big = upload(api, "beta", betaLarge);
        String other = upload(api, "alpha", alphaLarge);
        jobs.add(big);
        jobs.add(other);

        // kill the worker holding the large ingest once it is well into it
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        String owner = null;
        while (owner == null) {
            JsonNode state = get(api, "/v1/jobs/" + big);
            if (state.path("state").asText().equals("running") && state.path("progress").asDouble() > 0.2) {
                owner = leaseOwner(Long.parseLong(big));
            } else if (state.path("state").asText().equals("succeeded") || System.nanoTime() > deadline) {
                fail("the ingest finished or never started before it could be interrupted: " + state);
            } else {
                Thread.sleep(5);
            }
        }
        long pid = Long.parseLong(owner.split("/")[1]);
        Instance victim = w1.process().pid() == pid ? w1 : w2;
        assertEquals(pid, victim.process().pid(), "the lease names one of the two worker processes: " + owner);
        victim.process().destroyForcibly().waitFor(); // SIGKILL

        for (String job : jobs) {
            JsonNode done = await(api, job) == null ? null : get(api, "/v1/jobs/" + job);
            assertEquals("succeeded", done.path("state").asText(), done.toString());
        }
        try (Connection c = DriverManager.getConnection(database.url())) {
            assertEquals(0, count(c, "SELECT COUNT(*) FROM jobs WHERE state <> 'succeeded'"), "every job succeeded, none left running");
            assertEquals(2, count(c, "SELECT attempts FROM jobs WHERE id = " + big), "the killed worker's job was claimed twice");
            try (ResultSet rs = c.createStatement().executeQuery("SELECT finished_by FROM jobs WHERE id = " + big)) {
                rs.next();
                assertNotEquals(owner, rs.getString(1), "the other worker finished the killed worker's job");
            }
            assertEquals(0, count(c, "SELECT COUNT(*) FROM (SELECT job_id FROM uploads WHERE state = 'committed' "
                    + "GROUP BY job_id HAVING COUNT(*) <> 1) x"), "each upload committed exactly once");
            assertEquals(4, count(c, "SELECT COUNT(*) FROM uploads WHERE state = 'committed'"));
            assertEquals(0, count(c, "SELECT COUNT(*) FROM spool_files"), "spooled bodies are removed with their jobs");
        }
        JsonNode beta = get(api, "/v1/panels/beta");
        assertEquals(400L * (30 + betaLargeDays), beta.path("rows").asLong(), beta.toString());

        // the same uploads and definitions in one process, one after the other
        try (TestServer single = new TestServer()) {
            single.upload("/v1/panels/alpha/uploads", panel(START, 30, 150, 1));
            single.upload("/v1/panels/beta/uploads", panel(START, 30, 400, 2));
            for (Map.Entry<String, String> f : FACTORS.entrySet()) {
                single.awaitJob(single.putJson("/v1/factors/" + f.getKey(), f.getValue(), TestServer.ADMIN).json().path("job").asText());
            }
            single.upload("/v1/panels/beta/uploads", betaLarge);
            single.upload("/v1/panels/alpha/uploads", alphaLarge);
            for (String factor : FACTORS.keySet()) {
                for (String query : List.of("", "?leg=long", "?leg=short", "?net=true")) {
                    String path = "/v1/factors/" + factor + "/returns" + query;
                    JsonNode expected = single.get(path).json();
                    JsonNode served = get(api, path);
                    assertEquals(expected.path("dates"), served.path("dates"), path);
                    assertTrue(!query.isEmpty() || expected.path("returns").size() > 100, path + ": " + expected);
                    for (int i = 0; i < expected.path("returns").size(); i++) {
                        JsonNode e = expected.path("returns").get(i);
                        JsonNode s = served.path("returns").get(i);
                        assertEquals(e.isNull() ? "null" : Long.toHexString(Double.doubleToRawLongBits(e.asDouble())),
                                s.isNull() ? "null" : Long.toHexString(Double.doubleToRawLongBits(s.asDouble())), path + " at " + i);
                    }
                }
            }
        }
    }

    private String leaseOwner(long job) throws Exception {
        try (Connection c = DriverManager.getConnection(database.url());
             ResultSet rs = c.createStatement().executeQuery("SELECT lease_owner FROM jobs WHERE id = " + job)) {
            return rs.next() ? rs.getString(1) : null;
        }
    }

    private static long count(Connection c, String sql) throws Exception {
        try (ResultSet rs = c.createStatement().executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    private URI uri(Instance i, String path) {
        return URI.create("http://127.0.0.1:" + i.port() + path);
    }

    private HttpResponse<String> send(Instance i, HttpRequest.Builder b) throws Exception {
        return client.send(b.header("Authorization", "Bearer " + TOKEN).timeout(Duration.ofSeconds(60)).build(),
                HttpResponse.BodyHandlers.ofString());
    }

    private String upload(Instance api, String panel, String csv) throws Exception {
        HttpResponse<String> r = send(api, HttpRequest.newBuilder(uri(api, "/v1/panels/" + panel + "/uploads"))
                .header("Content-Type", "text/csv").POST(HttpRequest.BodyPublishers.ofString(csv)));
        assertEquals(202, r.statusCode(), r.body());
        return JSON.readTree(r.body()).path("job").asText();
    }

    private JsonNode get(Instance i, String path) throws Exception {
        HttpResponse<String> r = send(i, HttpRequest.newBuilder(uri(i, path)));
        assertEquals(200, r.statusCode(), path + ": " + r.body());
        return JSON.readTree(r.body());
    }

    /** Waits for a job to finish; returns its id. */
    private String await(Instance api, String job) throws Exception {
        long deadline = System.nanoTime() + Duration.ofSeconds(180).toNanos();
        while (System.nanoTime() < deadline) {
            String s = get(api, "/v1/jobs/" + job).path("state").asText();
            if (s.equals("succeeded") || s.equals("failed")) {
                return job;
            }
            Thread.sleep(20);
        }
        fail("job " + job + " did not finish: " + get(api, "/v1/jobs/" + job));
        return null;
    }

    private static int freePort() throws IOException {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }
}
