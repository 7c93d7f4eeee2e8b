package dev.winnow.api;

import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeFalse;

/** The embedded store serves one process: a second one on the same data directory stops with one clear line. */
class EmbeddedStoreLockTest {

    @Test
    void aSecondProcessOnTheSameDataDirectoryIsRefusedWithOneLine() throws Exception {
        assumeFalse(TestDatabase.onPostgres(), "the embedded store only");
        try (TestServer server = new TestServer()) {
            ProcessBuilder pb = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                    "-Xmx128m", "-cp", System.getProperty("java.class.path"), "dev.winnow.app.Main", "serve");
            pb.environment().put("WINNOW_PORT", "0");
            pb.environment().put("WINNOW_DATA_DIR", server.dataDir().toString());
            pb.environment().remove("WINNOW_DB_URL");
            pb.redirectErrorStream(true);
            Process second = pb.start();
            try {
                assertTrue(second.waitFor(60, TimeUnit.SECONDS), "the second process did not stop");
                String output = new String(second.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
                assertEquals(1, second.exitValue(), output);
                String last = output.strip().lines().reduce((a, b) -> b).orElse("");
                assertTrue(last.startsWith("winnow: the store in " + server.dataDir() + " is in use by another Winnow process"), output);
                assertTrue(output.lines().noneMatch(l -> l.startsWith("\tat ")), "no stack trace: " + output);
            } finally {
                second.destroyForcibly();
            }
            assertEquals(200, server.get("/health").status(), "the first process is unharmed");
        }
    }
}
