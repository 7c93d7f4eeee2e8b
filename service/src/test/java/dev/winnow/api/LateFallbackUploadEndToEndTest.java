package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.winnow.app.Config;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Random;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Uploads of several megabytes (many parse chunks) on a server whose pool has two connections, where the one-pass
 * parse has already handed many dates to the background staging writer when it finds out that it must give up (a
 * date's row comes back at the end of the file) or that the upload is bad (an error deep in the file). The fallback
 * must discard what was staged and stage afresh without waiting on a writer that is gone (an upload stalled here
 * before), and a failed upload must leave nothing behind. The panel built through the fallback is compared with the
 * same rows uploaded in date order, which takes the one-pass path, on the same server.
 */
class LateFallbackUploadEndToEndTest {
    static final String HEADER = "date,security,return,market_cap,score,sector\n";
    static final int SECURITIES = 40;
    static final int DATES = 1300;
    static TestServer server;
    static List<String> rows;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer(new Config.Instance(2, Config.Role.ALL, 1, 30, false));
        rows = new ArrayList<>();
        Random random = new Random(4711);
        LocalDate d = LocalDate.of(2010, 1, 4);
        for (int t = 0; t < DATES; t++) {
            while (d.getDayOfWeek() == DayOfWeek.SATURDAY || d.getDayOfWeek() == DayOfWeek.SUNDAY) {
                d = d.plusDays(1);
            }
            for (int s = 0; s < SECURITIES; s++) {
                rows.add(String.format(Locale.ROOT, "%s,SEC%03d,%.6f,%.2f,%.4f,%s", d, s, 0.02 * random.nextGaussian(),
                        100 + 900 * random.nextDouble(), random.nextGaussian(), s % 3 == 0 ? "north" : "south"));
            }
            d = d.plusDays(1);
        }
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    /** The rows in date order, with the row at {@code moved} taken out and appended at the end (a date going back). */
    private static String withRowMovedToTheEnd(int moved) {
        StringBuilder sb = new StringBuilder(HEADER);
        for (int i = 0; i < rows.size(); i++) {
            if (i != moved) {
                sb.append(rows.get(i)).append('\n');
            }
        }
        return sb.append(rows.get(moved)).append('\n').toString();
    }

    private static String inDateOrder() {
        StringBuilder sb = new StringBuilder(HEADER);
        rows.forEach(r -> sb.append(r).append('\n'));
        return sb.toString();
    }

    private static JsonNode panelWithoutName(String name) {
        ObjectNode panel = (ObjectNode) server.get("/v1/panels/" + name).json();
        panel.remove("name");
        return panel;
    }

    @Test
    void aLateGiveUpDiscardsTheStagedDatesAndTheTwoPassesGiveTheSamePanel() {
        String late = withRowMovedToTheEnd(3);
        assertTrue(late.length() > 2 << 20, "several parse chunks");
        assertEquals("succeeded", server.upload("/v1/panels/ordered/uploads", inDateOrder()).path("state").asText());
        for (int i = 0; i < 3; i++) {
            String panel = "late" + i;
            JsonNode job = server.upload("/v1/panels/" + panel + "/uploads", late);
            assertEquals("succeeded", job.path("state").asText(), job.toString());
            assertEquals(panelWithoutName("ordered"), panelWithoutName(panel));
        }
        for (String name : new String[] {"ordered", "late0"}) {
            var put = server.putJson("/v1/factors/" + name + "-score",
                    "{\"panel\":\"" + name + "\",\"method\":\"sort\",\"signal\":\"score\",\"rebalance\":\"monthly\"}", ADMIN);
            assertEquals(202, put.status(), put.body());
            assertEquals("succeeded", server.awaitJob(put.json().path("job").asText()).path("state").asText());
        }
        ObjectNode expected = (ObjectNode) server.get("/v1/factors/ordered-score/returns").json();
        ObjectNode actual = (ObjectNode) server.get("/v1/factors/late0-score/returns").json();
        assertTrue(expected.path("dates").size() > 1000, "a series to compare");
        expected.remove("factor");
        actual.remove("factor");
        // the two files give the securities their ids in different orders (in the late file SEC003 first appears on
        // the second date, after SEC039), so a portfolio sum adds the same terms in another order: equal up to rounding
        JsonNode e = expected.remove("returns");
        JsonNode a = actual.remove("returns");
        assertEquals(expected, actual);
        assertEquals(e.size(), a.size());
        for (int i = 0; i < e.size(); i++) {
            assertEquals(e.get(i).asDouble(), a.get(i).asDouble(), 1e-15, "return " + i);
        }
    }

    @Test
    void anErrorDeepInTheFileFailsTheUploadWithItsLineAndLeavesNothingBehind() {
        int bad = rows.size() - 500;
        StringBuilder sb = new StringBuilder(HEADER);
        for (int i = 0; i < rows.size(); i++) {
            String row = rows.get(i);
            sb.append(i == bad ? row.replaceFirst(",SEC(\\d+),[^,]+,", ",SEC$1,not-a-number,") : row).append('\n');
        }
        for (int i = 0; i < 2; i++) {
            JsonNode job = server.upload("/v1/panels/broken/uploads", sb.toString());
            assertEquals("failed", job.path("state").asText(), job.toString());
            JsonNode first = job.path("errors").get(0);
            assertEquals(bad + 2, first.path("line").asLong(), job.toString());
            assertEquals("return", first.path("column").asText(), job.toString());
            assertEquals(404, server.get("/v1/panels/broken").status(), "nothing of the failed upload is visible");
        }
        assertEquals("succeeded", server.upload("/v1/panels/broken/uploads", inDateOrder()).path("state").asText());
        assertEquals(rows.size(), server.get("/v1/panels/broken").json().path("rows").asLong());
    }
}
