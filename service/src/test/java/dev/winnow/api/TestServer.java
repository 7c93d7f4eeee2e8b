package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.app.Config;
import dev.winnow.app.Winnow;
import dev.winnow.store.TestDatabase;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Comparator;
import java.util.zip.GZIPOutputStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * The real server on a random port with a temporary store, driven over HTTP. The store is H2 under a temporary
 * directory, or a fresh schema of the PostgreSQL database that WINNOW_TEST_DB_URL names (see {@link TestDatabase}).
 */
public final class TestServer implements AutoCloseable {
    public static final String ADMIN = "test-admin-token";
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private final Path dir;
    private final TestDatabase database;
    private final Config.Instance instance;
    private final dev.winnow.store.Limits limits;
    private Winnow winnow;
    private final HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    public TestServer() throws IOException {
        this(Config.Instance.DEFAULT);
    }

    /** A server with other instance settings (role, worker threads, lease). */
    public TestServer(Config.Instance instance) throws IOException {
        // no free-space floor: the tests' uploads must not depend on how full the machine's disk is
        this(Files.createTempDirectory("winnow-test"), new dev.winnow.store.Limits(dev.winnow.store.Limits.DEFAULTS.maxUploadBytes(), 0), instance);
    }

    /** A server on the given data directory with the given limits (tests of limits and storage faults). */
    public TestServer(Path dir, dev.winnow.store.Limits limits) throws IOException {
        this(dir, limits, Config.Instance.DEFAULT);
    }

    private TestServer(Path dir, dev.winnow.store.Limits limits, Config.Instance instance) throws IOException {
        this.dir = dir;
        this.limits = limits;
        this.instance = instance;
        this.database = TestDatabase.fresh(dir, Config.defaultH2Url(dir));
        start();
    }

    public void start() throws IOException {
        winnow = Winnow.start(config());
    }

    /** The configuration this server runs with: port 0, its store, the test admin token. */
    public Config config() {
        return new Config(0, "127.0.0.1", dir, database.url(), ADMIN).withLimits(limits).withInstance(instance);
    }

    /** The JDBC URL of this server's store. */
    public String dbUrl() {
        return database.url();
    }

    /** Stops and starts the service on the same store, as after a restart. */
    public void restart() throws IOException {
        winnow.close();
        start();
    }

    public Winnow winnow() {
        return winnow;
    }

    public Path dataDir() {
        return dir;
    }

    public URI uri(String path) {
        return URI.create("http://127.0.0.1:" + winnow.port() + path);
    }

    public record Reply(int status, String body, java.net.http.HttpHeaders headers) {
        public JsonNode json() {
            try {
                return MAPPER.readTree(body);
            } catch (IOException e) {
                throw new AssertionError("not JSON: " + body, e);
            }
        }

        public String header(String name) {
            return headers.firstValue(name).orElse(null);
        }
    }

    /**
     * Sends the request and checks the answer against openapi.yaml ({@link ContractValidator}): an answer the
     * document does not describe fails the test, whatever the test itself checks.
     */
    public Reply send(HttpRequest.Builder request) {
        try {
            HttpRequest built = request.build();
            HttpResponse<String> r = client.send(built, HttpResponse.BodyHandlers.ofString(StandardCharsets.UTF_8));
            ContractValidator.shared().check(built.method(), built.uri(), r.statusCode(),
                    r.headers().firstValue("Content-Type").orElse(null), r.body());
            return new Reply(r.statusCode(), r.body(), r.headers());
        } catch (IOException | InterruptedException e) {
            throw new AssertionError("request failed", e);
        }
    }

    public HttpRequest.Builder request(String path, String token) {
        HttpRequest.Builder b = HttpRequest.newBuilder(uri(path)).timeout(Duration.ofSeconds(60));
        if (token != null) {
            b.header("Authorization", "Bearer " + token);
        }
        return b;
    }

    public Reply get(String path) {
        return send(request(path, ADMIN).GET());
    }

    public Reply get(String path, String token) {
        return send(request(path, token).GET());
    }

    public Reply postJson(String path, String json, String token) {
        return send(request(path, token).header("Content-Type", "application/json").POST(HttpRequest.BodyPublishers.ofString(json)));
    }

    public Reply putJson(String path, String json, String token) {
        return send(request(path, token).header("Content-Type", "application/json").PUT(HttpRequest.BodyPublishers.ofString(json)));
    }

    public Reply delete(String path, String token) {
        return send(request(path, token).DELETE());
    }

    public Reply postCsv(String path, String csv, String token) {
        return send(request(path, token).header("Content-Type", "text/csv").POST(HttpRequest.BodyPublishers.ofString(csv)));
    }

    public Reply postCsvGzip(String path, String csv, String token) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(bytes)) {
            gz.write(csv.getBytes(StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new AssertionError(e);
        }
        return send(request(path, token).header("Content-Type", "text/csv").header("Content-Encoding", "gzip")
                .POST(HttpRequest.BodyPublishers.ofByteArray(bytes.toByteArray())));
    }

    /** Polls a job until it leaves queued/running; returns its final JSON. */
    public JsonNode awaitJob(String jobId) {
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        while (System.nanoTime() < deadline) {
            JsonNode job = get("/v1/jobs/" + jobId).json();
            String state = job.path("state").asText();
            if (state.equals("succeeded") || state.equals("failed")) {
                return job;
            }
            try {
                Thread.sleep(20);
            } catch (InterruptedException e) {
                throw new AssertionError(e);
            }
        }
        fail("job " + jobId + " did not finish");
        return null;
    }

    /** Uploads and waits; asserts 202 and returns the finished job. */
    public JsonNode upload(String path, String csv) {
        Reply r = postCsv(path, csv, ADMIN);
        assertEquals(202, r.status(), r.body());
        return awaitJob(r.json().path("job").asText());
    }

    public static void assertProblem(Reply r, int status) {
        assertEquals(status, r.status(), r.body());
        String type = r.header("Content-Type");
        if (type == null || !type.startsWith("application/problem+json")) {
            fail("expected application/problem+json, got " + type + ": " + r.body());
        }
        JsonNode body = r.json();
        assertEquals(status, body.path("status").asInt(), r.body());
        if (body.path("detail").asText().isBlank()) {
            fail("problem without detail: " + r.body());
        }
    }

    @Override
    public void close() throws IOException {
        winnow.close();
        database.close();
        try (var files = Files.walk(dir)) {
            files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        }
    }
}
