package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

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
import java.util.Map;

import static org.junit.jupiter.api.Assertions.fail;

/** The service as a child JVM with its own heap limit and environment, on a temporary H2 store. */
final class ChildService implements AutoCloseable {
    static final String TOKEN = "child-service-token";
    private static final ObjectMapper JSON = new ObjectMapper();

    private final HttpClient client = HttpClient.newHttpClient();
    private final Path dir;
    private final int port;
    private final Process process;

    ChildService(String maxHeap, Map<String, String> env) throws Exception {
        dir = Files.createTempDirectory("winnow-child");
        try (ServerSocket socket = new ServerSocket(0)) {
            port = socket.getLocalPort();
        }
        ProcessBuilder pb = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Xmx" + maxHeap, "-cp", System.getProperty("java.class.path"), "dev.winnow.app.Main", "serve");
        pb.environment().put("WINNOW_PORT", String.valueOf(port));
        pb.environment().put("WINNOW_DATA_DIR", dir.toString());
        pb.environment().put("WINNOW_ADMIN_TOKEN", TOKEN);
        pb.environment().put("WINNOW_MIN_FREE_BYTES", "0");
        pb.environment().remove("WINNOW_DB_URL");
        pb.environment().putAll(env);
        pb.redirectErrorStream(true).redirectOutput(dir.resolve("service.log").toFile());
        process = pb.start();
        long deadline = System.nanoTime() + Duration.ofSeconds(60).toNanos();
        while (System.nanoTime() < deadline) {
            try {
                if (client.send(HttpRequest.newBuilder(uri("/health")).build(), HttpResponse.BodyHandlers.ofString()).statusCode() == 200) {
                    return;
                }
            } catch (IOException notYet) {
                Thread.sleep(100);
            }
        }
        fail("the service did not start: " + log());
    }

    URI uri(String path) {
        return URI.create("http://127.0.0.1:" + port + path);
    }

    String log() throws IOException {
        return Files.readString(dir.resolve("service.log"));
    }

    HttpResponse<String> send(HttpRequest.Builder request) throws Exception {
        return client.send(request.header("Authorization", "Bearer " + TOKEN).build(), HttpResponse.BodyHandlers.ofString());
    }

    JsonNode get(String path) throws Exception {
        return JSON.readTree(send(HttpRequest.newBuilder(uri(path))).body());
    }

    JsonNode awaitJob(String job) throws Exception {
        long deadline = System.nanoTime() + Duration.ofSeconds(180).toNanos();
        while (System.nanoTime() < deadline) {
            JsonNode state = get("/v1/jobs/" + job);
            if (List.of("succeeded", "failed").contains(state.path("state").asText())) {
                return state;
            }
            Thread.sleep(50);
        }
        fail("job " + job + " did not finish: " + get("/v1/jobs/" + job) + "\n" + log());
        return null;
    }

    /** Sends the process a signal by name ("STOP", "CONT"): stopped, it is alive to the operating system but silent. */
    void signal(String name) throws Exception {
        Process kill = new ProcessBuilder("kill", "-" + name, String.valueOf(process.pid())).inheritIO().start();
        if (kill.waitFor() != 0) {
            fail("kill -" + name + " " + process.pid() + " failed");
        }
    }

    static String jobOf(HttpResponse<String> accepted) throws IOException {
        return JSON.readTree(accepted.body()).path("job").asText();
    }

    @Override
    public void close() throws IOException {
        process.destroyForcibly();
        try {
            process.waitFor();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        try (var files = Files.walk(dir)) {
            files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        }
    }
}
