package dev.winnow.app;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Path;
import java.time.Duration;
import java.time.OffsetDateTime;

/**
 * The benchmarks' HTTP client of a running service on loopback: uploads, definitions and job polling with a bearer
 * token. Used by the {@code bench} command and by the DuckDB comparison in the bench module.
 */
public final class BenchClient {
    private static final ObjectMapper JSON = new ObjectMapper();

    private final HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10)).build();
    private final int port;
    private final String token;
    private final long pollMillis;

    /** @param pollMillis how often {@link #awaitJob} asks, so the end of a job is seen at most about that late */
    public BenchClient(int port, String token, long pollMillis) {
        this.port = port;
        this.token = token;
        this.pollMillis = pollMillis;
    }

    public URI uri(String path) {
        return URI.create("http://127.0.0.1:" + port + path);
    }

    /** Sends the file as a CSV upload; returns the job id of the 202 answer. */
    public String upload(String path, Path file) throws IOException, InterruptedException {
        HttpRequest request = HttpRequest.newBuilder(uri(path))
                .header("Authorization", "Bearer " + token).header("Content-Type", "text/csv")
                .POST(HttpRequest.BodyPublishers.ofFile(file)).build();
        return jobOf(client.send(request, HttpResponse.BodyHandlers.ofString()));
    }

    /** PUTs a factor definition; returns the job id of the 202 answer. */
    public String define(String name, String definition) throws IOException, InterruptedException {
        HttpRequest request = HttpRequest.newBuilder(uri("/v1/factors/" + name))
                .header("Authorization", "Bearer " + token).header("Content-Type", "application/json")
                .PUT(HttpRequest.BodyPublishers.ofString(definition)).build();
        return jobOf(client.send(request, HttpResponse.BodyHandlers.ofString()));
    }

    /** PUTs a variant family; returns the job id of the 202 answer. */
    public String declareFamily(String name, String declaration) throws IOException, InterruptedException {
        HttpRequest request = HttpRequest.newBuilder(uri("/v1/families/" + name))
                .header("Authorization", "Bearer " + token).header("Content-Type", "application/json")
                .PUT(HttpRequest.BodyPublishers.ofString(declaration)).build();
        return jobOf(client.send(request, HttpResponse.BodyHandlers.ofString()));
    }

    /** A POST without a body that queues a job (an admin action); returns the job id of the 202 answer. */
    public String postForJob(String path) throws IOException, InterruptedException {
        HttpRequest request = HttpRequest.newBuilder(uri(path)).header("Authorization", "Bearer " + token)
                .POST(HttpRequest.BodyPublishers.noBody()).build();
        return jobOf(client.send(request, HttpResponse.BodyHandlers.ofString()));
    }

    /** A DELETE with the token; returns the status code. */
    public int delete(String path) throws IOException, InterruptedException {
        return client.send(HttpRequest.newBuilder(uri(path)).header("Authorization", "Bearer " + token).DELETE()
                .timeout(Duration.ofSeconds(60)).build(), HttpResponse.BodyHandlers.discarding()).statusCode();
    }

    /** A GET with the token. */
    public HttpResponse<String> get(String path) throws IOException, InterruptedException {
        return client.send(HttpRequest.newBuilder(uri(path)).header("Authorization", "Bearer " + token).GET()
                .timeout(Duration.ofSeconds(120)).build(), HttpResponse.BodyHandlers.ofString());
    }

    /** A PUT of a JSON body with the token (for a definition that starts no job, such as an external series). */
    public HttpResponse<String> putJson(String path, String body) throws IOException, InterruptedException {
        return client.send(HttpRequest.newBuilder(uri(path)).header("Authorization", "Bearer " + token)
                .header("Content-Type", "application/json").PUT(HttpRequest.BodyPublishers.ofString(body))
                .timeout(Duration.ofSeconds(60)).build(), HttpResponse.BodyHandlers.ofString());
    }

    /** A POST of a JSON body with the token. */
    public HttpResponse<String> postJson(String path, String body) throws IOException, InterruptedException {
        return client.send(HttpRequest.newBuilder(uri(path)).header("Authorization", "Bearer " + token)
                .header("Content-Type", "application/json").POST(HttpRequest.BodyPublishers.ofString(body))
                .timeout(Duration.ofSeconds(120)).build(), HttpResponse.BodyHandlers.ofString());
    }

    /** Waits for the job to succeed and returns it; throws when it fails. */
    public JsonNode awaitJob(String id) throws IOException, InterruptedException {
        while (true) {
            JsonNode job = JSON.readTree(get("/v1/jobs/" + id).body());
            String state = job.path("state").asText();
            if (state.equals("failed")) {
                throw new IllegalStateException("job " + id + " failed: " + job);
            }
            if (state.equals("succeeded")) {
                return job;
            }
            Thread.sleep(pollMillis);
        }
    }

    /** The worker's own time for a finished job: started_at to finished_at. */
    public static double jobSeconds(JsonNode job) {
        OffsetDateTime started = OffsetDateTime.parse(job.path("started_at").asText());
        OffsetDateTime finished = OffsetDateTime.parse(job.path("finished_at").asText());
        return Duration.between(started, finished).toNanos() / 1e9;
    }

    private static String jobOf(HttpResponse<String> response) throws IOException {
        if (response.statusCode() != 202) {
            throw new IllegalStateException("expected 202, got " + response.statusCode() + ": " + response.body());
        }
        return JSON.readTree(response.body()).path("job").asText();
    }
}
