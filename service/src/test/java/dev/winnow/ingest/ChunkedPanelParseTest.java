package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The one-pass parse on all cores gives what the two-pass parse gives (its reference here: {@code workers = 0}), for
 * any chunk size, so chunk boundaries fall inside every kind of record: the same cross-sections in the same order,
 * the same errors with the same line numbers, counts and statistics, whether it finishes in one pass or gives up and
 * starts over.
 */
class ChunkedPanelParseTest {

    @TempDir
    Path dir;

    private static final int[] CHUNK_SIZES = {1, 7, 64, 333, 4096, ChunkedPanelParse.CHUNK_BYTES};

    private record Run(PanelParseResult result, List<CrossSection> received, Map<String, Integer> ids) {
    }

    private Run run(String csv, boolean gzip, int chunkBytes, int workers, Map<String, ColumnType> schema, UploadMode mode)
            throws Exception {
        Path file = gzip ? UploadFixtures.writeGzip(dir, csv) : UploadFixtures.write(dir, csv);
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        UploadFixtures.DecreasingIds ids = new UploadFixtures.DecreasingIds();
        PanelUpload upload = new PanelUpload(file, gzip, mode, mode == UploadMode.APPEND ? LocalDate.of(2020, 12, 31) : null, schema);
        PanelParseResult result = new PanelUploadParser(PanelUploadParser.DEFAULT_ROW_BUDGET, chunkBytes, workers)
                .parse(upload, ids, sink, ProgressListener.NONE);
        assertEquals(ids.ids.size(), ids.calls, "one id request per distinct code");
        return new Run(result, sink.received, ids.ids);
    }

    private void assertSameAsTwoPasses(String csv, Map<String, ColumnType> schema, UploadMode mode) throws Exception {
        Run reference = run(csv, false, ChunkedPanelParse.CHUNK_BYTES, 0, schema, mode);
        for (boolean gzip : new boolean[] {false, true}) {
            for (int chunk : CHUNK_SIZES) {
                Run fast = run(csv, gzip, chunk, 2, schema, mode);
                String where = "chunks of " + chunk + (gzip ? " bytes, gzip" : " bytes");
                PanelParseResult a = reference.result();
                PanelParseResult b = fast.result();
                assertEquals(a.errors(), b.errors(), where);
                assertEquals(a.errorCount(), b.errorCount(), where);
                assertEquals(a.rowsRead(), b.rowsRead(), where);
                assertEquals(a.rowsAccepted(), b.rowsAccepted(), where);
                assertEquals(a.rowsRejected(), b.rowsRejected(), where);
                assertEquals(a.schema(), b.schema(), where);
                assertEquals(a.newColumns(), b.newColumns(), where);
                assertEquals(a.dates(), b.dates(), where);
                assertSameStats(a.stats(), b.stats(), where);
                assertEquals(a.rowsEmitted(), b.rowsEmitted(), where);
                if (a.accepted()) {
                    // a rejected upload may have asked for ids before its problems showed: they are discarded with it
                    assertEquals(reference.ids(), fast.ids(), where + ": ids in order of first appearance");
                }
                assertEquals(reference.received().size(), fast.received().size(), where);
                for (int i = 0; i < reference.received().size(); i++) {
                    assertSameSection(reference.received().get(i), fast.received().get(i), where);
                }
            }
        }
    }

    /** Equal, but for means summed in another order (chunk by chunk): those agree to rounding. */
    private static void assertSameStats(UploadStats a, UploadStats b, String where) {
        assertEquals(a.dateCount(), b.dateCount(), where);
        assertEquals(a.firstDate(), b.firstDate(), where);
        assertEquals(a.lastDate(), b.lastDate(), where);
        assertEquals(a.minRowsPerDate(), b.minRowsPerDate(), where);
        assertEquals(a.maxRowsPerDate(), b.maxRowsPerDate(), where);
        assertEquals(a.meanRowsPerDate(), b.meanRowsPerDate(), where);
        assertEquals(a.distinctSecurities(), b.distinctSecurities(), where);
        assertEquals(a.columns().keySet(), b.columns().keySet(), where);
        a.columns().forEach((name, x) -> {
            ColumnSummary y = b.columns().get(name);
            assertEquals(x.type(), y.type(), where + " " + name);
            assertEquals(x.present(), y.present(), where + " " + name);
            assertEquals(x.missing(), y.missing(), where + " " + name);
            assertEquals(x.min(), y.min(), where + " " + name);
            assertEquals(x.max(), y.max(), where + " " + name);
            if (Double.isNaN(x.mean())) {
                assertEquals(x.mean(), y.mean(), where + " " + name);
            } else {
                assertEquals(x.mean(), y.mean(), 1e-12 * Math.max(1, Math.abs(x.mean())), where + " " + name);
            }
        });
    }

    private static void assertSameSection(CrossSection a, CrossSection b, String where) {
        assertEquals(a.date(), b.date(), where);
        assertArrayEquals(a.securityIds(), b.securityIds(), where);
        assertArrayEquals(a.returns(), b.returns(), where);
        assertArrayEquals(a.marketCaps(), b.marketCaps(), where);
        assertEquals(a.numbers().keySet(), b.numbers().keySet(), where);
        a.numbers().forEach((k, v) -> assertArrayEquals(v, b.numbers().get(k), where + " " + k));
        assertEquals(a.labels().keySet(), b.labels().keySet(), where);
        a.labels().forEach((k, v) -> assertArrayEquals(v, b.labels().get(k), where + " " + k));
    }

    /** A date-major panel: securities in shuffled order within each date, missing cells, labels with commas. */
    private static String panel(int dates, int securities, long seed, String lineBreak, boolean quotedLabels) {
        Random random = new Random(seed);
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score,sector" + lineBreak);
        LocalDate date = LocalDate.of(2021, 1, 29);
        String[] sectors = quotedLabels ? new String[] {"Ferrolith", "\"Aquaverde, east\"", "\"two\nlines\"", "\"say \"\"hi\"\"\"", ""}
                : new String[] {"Ferrolith", "Aquaverde", "Mossfield", ""};
        for (int d = 0; d < dates; d++) {
            List<Integer> order = new ArrayList<>();
            for (int s = 0; s < securities; s++) {
                order.add(s);
            }
            java.util.Collections.shuffle(order, random);
            for (int s : order) {
                if (random.nextInt(8) == 0) {
                    continue;
                }
                csv.append(date).append(",S").append(s).append(',')
                        .append(random.nextInt(15) == 0 ? "" : String.valueOf(random.nextGaussian() * 0.03)).append(',')
                        .append(random.nextInt(6) == 0 ? "" : String.valueOf(1 + random.nextInt(100000))).append(',')
                        .append(random.nextInt(10) == 0 ? "" : String.format(java.util.Locale.ROOT, "%.4f", random.nextGaussian())).append(',')
                        .append(sectors[random.nextInt(sectors.length)]).append(lineBreak);
            }
            date = date.plusMonths(1);
        }
        return csv.toString();
    }

    @Test
    void dateMajorFilesGiveWhatTwoPassesGive() throws Exception {
        assertSameAsTwoPasses(panel(12, 30, 1, "\n", false), Map.of(), UploadMode.APPEND);
        assertSameAsTwoPasses(panel(9, 25, 2, "\r\n", false), Map.of(), UploadMode.REVISE);
    }

    @Test
    void manyDatesGiveWhatTwoPassesGive() throws Exception {
        assertSameAsTwoPasses(panel(700, 3, 7, "\n", false), Map.of(), UploadMode.REVISE);
    }

    @Test
    void quotedFieldsWithLineBreaksGiveWhatTwoPassesGive() throws Exception {
        assertSameAsTwoPasses(panel(8, 20, 3, "\n", true), Map.of(), UploadMode.REVISE);
    }

    @Test
    void filesOutOfDateOrderStartOverAndGiveWhatTwoPassesGive() throws Exception {
        String sorted = panel(6, 15, 4, "\n", false);
        String[] lines = sorted.split("\n");
        List<String> body = new ArrayList<>(List.of(lines).subList(1, lines.length));
        java.util.Collections.reverse(body);
        assertSameAsTwoPasses(lines[0] + "\n" + String.join("\n", body) + "\n", Map.of(), UploadMode.REVISE);
        java.util.Collections.shuffle(body, new Random(5));
        assertSameAsTwoPasses(lines[0] + "\n" + String.join("\n", body) + "\n", Map.of(), UploadMode.REVISE);
        // one date comes back at the very end
        assertSameAsTwoPasses(sorted + "2021-01-29,LATE,0.01,5,1,Mossfield\n", Map.of(), UploadMode.REVISE);
    }

    @Test
    void errorsAreTheSameWithTheSameLines() throws Exception {
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score\n");
        for (int i = 0; i < 400; i++) {
            String date = "2024-0" + (1 + i / 100) + "-1" + (i % 3 == 0 ? "5" : "5");
            csv.append(date).append(",S").append(i % 100).append(',')
                    .append(i % 37 == 0 ? "abc" : i % 41 == 0 ? "-2" : "0.01").append(',')
                    .append(i % 53 == 0 ? "0" : "10").append(',')
                    .append(i % 61 == 0 ? "NaN" : "1.5").append('\n');
            if (i % 70 == 0) {
                csv.append('\n');
            }
        }
        assertSameAsTwoPasses(csv.toString(), Map.of(), UploadMode.REVISE);
        assertSameAsTwoPasses(csv.toString().replace("abc", "0.02").replace(",-2,", ",0.03,"), Map.of(), UploadMode.REVISE);
    }

    @Test
    void duplicatesAndBadShapesGiveWhatTwoPassesGive() throws Exception {
        String csv = "date,security,return,score\n2024-01-31,A,0.01,1\n2024-01-31,B,0.02,2\n2024-01-31,A,0.03,3\n"
                + "2024-02-29,A,0.01,1\n2024-02-29,B,0.01\n2024-02-29,\"C,0.01,1\n";
        assertSameAsTwoPasses(csv, Map.of(), UploadMode.REVISE);
        assertSameAsTwoPasses("date,security,return,score\n2024-01-31,A,0.01,1\n2024-01-31,B,0.02,2\n2024-01-31,A,0.03,3\n",
                Map.of(), UploadMode.REVISE);
    }

    @Test
    void columnTypesFollowTheWholeFile() throws Exception {
        // text first: a label column; numbers only: a number column; numbers then text late: a label column
        StringBuilder csv = new StringBuilder("date,security,return,tier,beta,code\n");
        for (int i = 0; i < 300; i++) {
            csv.append("2024-").append(String.format("%02d", 1 + i / 30)).append("-01,S").append(i % 30).append(",0.01,")
                    .append(i % 2 == 0 ? "main" : "7").append(',').append(i % 5 == 0 ? "" : "0.9").append(',')
                    .append(i == 280 ? "X1" : i == 250 ? "NaN" : String.valueOf(i)).append('\n');
        }
        assertSameAsTwoPasses(csv.toString(), Map.of(), UploadMode.REVISE);
        assertSameAsTwoPasses(csv.toString(), Map.of("tier", ColumnType.LABEL, "beta", ColumnType.NUMBER), UploadMode.REVISE);
        assertSameAsTwoPasses("date,security,return,empty\n2024-01-31,A,0.01,\n2024-02-29,A,0.01,\n", Map.of(), UploadMode.REVISE);
    }

    @Test
    void appendsBeforeTheLastDateAreErrors() throws Exception {
        assertSameAsTwoPasses("date,security,return\n2020-12-31,A,0.01\n2021-01-29,A,0.01\n", Map.of(), UploadMode.APPEND);
    }

    @Test
    void aLargeSortedFileTakesTheOnePassPath() throws Exception {
        String csv = panel(40, 300, 6, "\n", false);
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink() {
            @Override
            public void discardAccepted() {
                throw new AssertionError("a date-major file should not need the two passes");
            }
        };
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv), false, UploadMode.REVISE, null, Map.of());
        PanelParseResult result = new PanelUploadParser(PanelUploadParser.DEFAULT_ROW_BUDGET, 4096, 2)
                .parse(upload, new UploadFixtures.DecreasingIds(), sink, ProgressListener.NONE);
        assertTrue(result.accepted(), () -> result.errors().toString());
        assertEquals(40, sink.received.size());
    }
}
