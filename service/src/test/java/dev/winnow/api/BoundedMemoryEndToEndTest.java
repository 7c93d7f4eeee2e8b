package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.store.Limits;
import org.junit.jupiter.api.Test;

import java.io.ByteArrayOutputStream;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.util.Map;
import java.util.zip.GZIPOutputStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Issue 14: a small gzip body that expands to millions of copies of one row ended in OutOfMemoryError inside the job.
 * Run against a service with a 128 MB heap: holding the 6 million rows of its one date would need about 170 MB, so
 * the job must fail with line-numbered duplicate errors in bounded memory (one date holds at most
 * {@link Limits#MAX_ROWS_PER_DATE} rows), and the worker must go on to the next upload.
 */
class BoundedMemoryEndToEndTest {

    @Test
    void oneRowRepeatedMillionsOfTimesIsALineNumberedDuplicateErrorNotAnOutOfMemoryError() throws Exception {
        int copies = 6_000_000;
        ByteArrayOutputStream zipped = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(zipped, 1 << 16)) {
            gz.write("date,security,return\n".getBytes(StandardCharsets.US_ASCII));
            byte[] row = "2024-01-31,SAME,0.01\n".getBytes(StandardCharsets.US_ASCII);
            byte[] block = new byte[row.length * 10_000];
            for (int i = 0; i < 10_000; i++) {
                System.arraycopy(row, 0, block, i * row.length, row.length);
            }
            for (int i = 0; i < copies / 10_000; i++) {
                gz.write(block);
            }
        }
        try (ChildService service = new ChildService("128m", Map.of())) {
            HttpResponse<String> accepted = service.send(HttpRequest.newBuilder(service.uri("/v1/panels/bomb/uploads"))
                    .header("Content-Type", "text/csv").header("Content-Encoding", "gzip")
                    .POST(HttpRequest.BodyPublishers.ofByteArray(zipped.toByteArray())));
            assertEquals(202, accepted.statusCode(), accepted.body());
            JsonNode job = service.awaitJob(ChildService.jobOf(accepted));
            assertEquals("failed", job.path("state").asText(), job.toString());
            JsonNode first = job.path("errors").get(0);
            assertEquals(3, first.path("line").asInt(), job.toString());
            assertEquals("security", first.path("column").asText(), job.toString());
            assertTrue(first.path("message").asText().contains("first at line 2"), job.toString());
            assertEquals(101, job.path("errors").size(), "100 errors and a line saying how many more: " + job);
            assertFalse(job.toString().contains("memory"), job.toString());
            assertFalse(service.log().contains("OutOfMemoryError"), "the job ran out of memory");

            HttpResponse<String> next = service.send(HttpRequest.newBuilder(service.uri("/v1/panels/fine/uploads"))
                    .header("Content-Type", "text/csv").POST(HttpRequest.BodyPublishers.ofString("date,security,return\n2024-01-31,A,0.01\n")));
            assertEquals("succeeded", service.awaitJob(ChildService.jobOf(next)).path("state").asText());
        }
    }
}
