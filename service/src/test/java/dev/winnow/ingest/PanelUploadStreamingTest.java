package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.CrossSection;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The second pass sends the same cross-sections whatever the file order, compression or budget. Expectations come
 * from the generated rows themselves (a plain in-memory model), never from the parser's output.
 */
class PanelUploadStreamingTest {

    private static final String HEADER = "date,security,return,market_cap,size,sector";

    /** One generated row, the model the parsed cross-sections are checked against. */
    record Row(LocalDate date, String security, double ret, double cap, double size, String sector) {
        String csv() {
            return date + "," + security + "," + text(ret) + "," + text(cap) + "," + text(size) + ","
                    + (sector == null ? "" : "\"" + sector.replace("\"", "\"\"") + "\"");
        }

        private static String text(double v) {
            return Double.isNaN(v) ? "" : Double.toString(v);
        }
    }

    @TempDir
    Path dir;

    private static List<Row> panel(int dates, int securities, long seed) {
        Random random = new Random(seed);
        String[] sectors = {"Energy", "Utilities, regulated", "Say \"hi\"", "two\nlines", null};
        List<Row> rows = new ArrayList<>();
        LocalDate date = LocalDate.of(2021, 1, 29);
        for (int d = 0; d < dates; d++) {
            for (int s = 0; s < securities; s++) {
                if (random.nextInt(10) == 0) {
                    continue;
                }
                rows.add(new Row(date, "SEC" + s, random.nextInt(20) == 0 ? Double.NaN : random.nextGaussian() * 0.05,
                        random.nextInt(5) == 0 ? Double.NaN : 1 + random.nextInt(1_000_000),
                        random.nextGaussian(), sectors[random.nextInt(sectors.length)]));
            }
            date = date.plusMonths(1);
        }
        return rows;
    }

    private static String csv(List<Row> rows, String lineBreak) {
        return HEADER + lineBreak + rows.stream().map(Row::csv).collect(Collectors.joining(lineBreak)) + lineBreak;
    }

    private record Run(PanelParseResult result, List<CrossSection> received, UploadFixtures.DecreasingIds ids) {
    }

    private Run run(Path file, boolean gzip, int budget) throws Exception {
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        UploadFixtures.DecreasingIds ids = new UploadFixtures.DecreasingIds();
        PanelUpload upload = new PanelUpload(file, gzip, UploadMode.APPEND, LocalDate.of(2020, 12, 31), Map.of());
        PanelParseResult result = new PanelUploadParser(budget).parse(upload, ids, sink, ProgressListener.NONE);
        assertTrue(result.accepted(), () -> result.errors().toString());
        return new Run(result, sink.received, ids);
    }

    /** Checks the received cross-sections against the model rows, security by security. */
    private static void assertMatchesModel(List<Row> rows, Run run) {
        Map<LocalDate, List<Row>> byDate = new TreeMap<>(rows.stream().collect(Collectors.groupingBy(Row::date)));
        assertEquals(new ArrayList<>(byDate.keySet()), run.received().stream().map(CrossSection::date).toList(),
                "one cross-section per date, ascending");
        int k = 0;
        for (List<Row> expected : byDate.values()) {
            CrossSection cs = run.received().get(k++);
            assertEquals(expected.size(), cs.size());
            for (Row row : expected) {
                int i = cs.rowOf(run.ids().ids.get(row.security()));
                assertTrue(i >= 0, row.security());
                assertEquals(row.ret(), cs.returns()[i], row.toString());
                assertEquals(row.cap(), cs.marketCaps()[i], row.toString());
                assertEquals(row.size(), cs.numberColumn("size")[i], row.toString());
                assertEquals(row.sector(), cs.labelColumn("sector")[i], row.toString());
            }
        }
    }

    @Test
    void sortedFileMatchesTheModel() throws Exception {
        List<Row> rows = panel(24, 40, 1);
        Run run = run(UploadFixtures.write(dir, csv(rows, "\n")), false, PanelUploadParser.DEFAULT_ROW_BUDGET);
        assertMatchesModel(rows, run);
        assertEquals(rows.size(), run.result().rowsEmitted());
        assertEquals(rows.size(), run.result().rowsAccepted());
        assertEquals(run.ids().ids.size(), run.ids().calls, "one id request per distinct security");
    }

    @Test
    void shuffledFileWithATinyBudgetMatchesTheModel() throws Exception {
        List<Row> rows = panel(24, 40, 2);
        List<Row> shuffled = new ArrayList<>(rows);
        Collections.shuffle(shuffled, new Random(3));
        Run run = run(UploadFixtures.write(dir, csv(shuffled, "\n")), false, 50);
        assertMatchesModel(rows, run);
    }

    @Test
    void contiguousBlocksInDescendingOrderMatchTheModel() throws Exception {
        List<Row> rows = panel(12, 30, 4);
        List<Row> descending = new ArrayList<>(rows);
        descending.sort(Comparator.comparing(Row::date).reversed());
        Run run = run(UploadFixtures.write(dir, csv(descending, "\n")), false, 40);
        assertMatchesModel(rows, run);
    }

    @Test
    void gzipCrlfAndByteOrderMarkReadTheSame() throws Exception {
        List<Row> rows = panel(6, 25, 5);
        Collections.shuffle(rows, new Random(6));
        Run run = run(UploadFixtures.writeGzip(dir, "\uFEFF" + csv(rows, "\r\n")), true, 30);
        assertMatchesModel(rows, run);
    }

    @Test
    void planGroupsDatesWithinTheBudget() {
        DateTable scattered = new DateTable();
        LocalDate jan = LocalDate.of(2024, 1, 31);
        LocalDate feb = LocalDate.of(2024, 2, 29);
        LocalDate mar = LocalDate.of(2024, 3, 29);
        for (LocalDate d : List.of(mar, jan, feb, jan, mar, feb, jan, feb, mar, mar)) {
            scattered.record(d);
        }
        assertFalse(scattered.inDateOrder());
        assertEquals(List.of(List.of(jan), List.of(feb), List.of(mar)), datesOf(scattered, 5));
        assertEquals(List.of(List.of(jan, feb), List.of(mar)), datesOf(scattered, 6));
        assertEquals(List.of(List.of(jan), List.of(feb), List.of(mar)), datesOf(scattered, 1),
                "a date larger than the budget still gets a range of its own");

        DateTable sorted = new DateTable();
        for (LocalDate d : List.of(jan, jan, feb, mar, mar)) {
            sorted.record(d);
        }
        assertTrue(sorted.inDateOrder());
        assertEquals(List.of(List.of(jan, feb, mar)), datesOf(sorted, 1), "a file in date order needs one read");
    }

    private static List<List<LocalDate>> datesOf(DateTable table, int budget) {
        return PanelSecondPass.plan(table, budget).stream()
                .map(range -> java.util.Arrays.stream(range).mapToObj(table::date).toList()).toList();
    }

    @Test
    void typesAreInferredForNewColumnsAndKeptForExistingOnes() throws Exception {
        String csv = "date,security,return,size,sector,code,notes,beta,momentum\n"
                + "2024-01-31,A,0.01,1.5,Energy,1,,,\n"
                + "2024-01-31,B,0.02,,,A7,,,\n";
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv), false, UploadMode.REVISE, null,
                Map.of("beta", ColumnType.NUMBER, "rating", ColumnType.LABEL, "momentum", ColumnType.NUMBER));
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        UploadFixtures.DecreasingIds ids = new UploadFixtures.DecreasingIds();
        PanelParseResult result = new PanelUploadParser().parse(upload, ids, sink, ProgressListener.NONE);
        assertTrue(result.accepted(), () -> result.errors().toString());
        assertEquals(List.of("size", "sector", "code", "notes"), List.copyOf(result.newColumns().keySet()));
        assertEquals(ColumnType.NUMBER, result.newColumns().get("size"));
        assertEquals(ColumnType.LABEL, result.newColumns().get("sector"));
        assertEquals(ColumnType.LABEL, result.newColumns().get("code"), "one text value makes the column labels");
        assertEquals(ColumnType.LABEL, result.newColumns().get("notes"), "a new column without values is a label");
        assertEquals(7, result.schema().size());
        assertEquals(ColumnType.NUMBER, result.schema().get("beta"));

        CrossSection cs = sink.received.get(0);
        int a = cs.rowOf(ids.ids.get("A"));
        int b = cs.rowOf(ids.ids.get("B"));
        assertEquals(1.5, cs.numberColumn("size")[a]);
        assertTrue(Double.isNaN(cs.numberColumn("size")[b]));
        assertEquals("1", cs.labelColumn("code")[a]);
        assertEquals("A7", cs.labelColumn("code")[b]);
        assertNull(cs.labelColumn("sector")[b]);
        assertTrue(cs.numbers().containsKey("beta"), "an existing numeric column without values stays numeric");
        assertTrue(Double.isNaN(cs.numberColumn("beta")[a]));
        assertFalse(cs.labels().containsKey("rating"), "a column absent from the upload is not sent");
        assertTrue(Double.isNaN(cs.marketCaps()[a]), "no market_cap column: all missing");
    }

    @Test
    void statsDescribeTheUpload() throws Exception {
        List<Row> rows = panel(10, 20, 7);
        Run run = run(UploadFixtures.write(dir, csv(rows, "\n")), false, PanelUploadParser.DEFAULT_ROW_BUDGET);
        UploadStats stats = run.result().stats();
        Map<LocalDate, Long> perDate = rows.stream().collect(Collectors.groupingBy(Row::date, Collectors.counting()));
        assertEquals(perDate.size(), stats.dateCount());
        assertEquals(Collections.min(perDate.keySet()), stats.firstDate());
        assertEquals(Collections.max(perDate.keySet()), stats.lastDate());
        assertEquals(Collections.min(perDate.values()).intValue(), stats.minRowsPerDate());
        assertEquals(Collections.max(perDate.values()).intValue(), stats.maxRowsPerDate());
        assertEquals((double) rows.size() / perDate.size(), stats.meanRowsPerDate(), 1e-12);
        assertEquals(rows.stream().map(Row::security).distinct().count(), stats.distinctSecurities());
        assertEquals(new ArrayList<>(new TreeMap<>(perDate).keySet()), run.result().dates());

        double[] returns = rows.stream().mapToDouble(Row::ret).filter(v -> !Double.isNaN(v)).toArray();
        ColumnSummary ret = stats.columns().get("return");
        assertEquals(returns.length, ret.present());
        assertEquals(rows.size() - returns.length, ret.missing());
        assertEquals(java.util.Arrays.stream(returns).min().orElseThrow(), ret.min());
        assertEquals(java.util.Arrays.stream(returns).max().orElseThrow(), ret.max());
        assertEquals(java.util.Arrays.stream(returns).average().orElseThrow(), ret.mean(), 1e-15);
        ColumnSummary sector = stats.columns().get("sector");
        assertEquals(ColumnType.LABEL, sector.type());
        assertEquals(rows.stream().filter(r -> r.sector() != null).count(), sector.present());
        assertTrue(Double.isNaN(sector.mean()));
    }

    @Test
    void progressRisesToOneWithRowCounts() throws Exception {
        List<Row> rows = panel(30, 3000, 8);
        Collections.shuffle(rows, new Random(9));
        List<IngestProgress> reports = new ArrayList<>();
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv(rows, "\n")), false, UploadMode.REVISE,
                null, Map.of());
        new PanelUploadParser(20_000).parse(upload, new UploadFixtures.DecreasingIds(),
                new UploadFixtures.CollectingSink(), reports::add);
        assertTrue(reports.size() > 3, "reports during the passes, not only at the end");
        for (int i = 1; i < reports.size(); i++) {
            assertTrue(reports.get(i).fraction() >= reports.get(i - 1).fraction(), "never decreases");
        }
        IngestProgress last = reports.get(reports.size() - 1);
        assertEquals(1.0, last.fraction());
        assertEquals(rows.size(), last.rowsRead());
        assertEquals(rows.size(), last.rowsAccepted());
        assertEquals(rows.size(), last.rowsEmitted());
    }

    @Test
    void idsAreSortedWithinEachCrossSection() throws Exception {
        List<Row> rows = panel(3, 50, 10);
        Run run = run(UploadFixtures.write(dir, csv(rows, "\n")), false, PanelUploadParser.DEFAULT_ROW_BUDGET);
        for (CrossSection cs : run.received()) {
            int[] sorted = cs.securityIds().clone();
            java.util.Arrays.sort(sorted);
            assertArrayEquals(sorted, cs.securityIds());
        }
    }

    @Test
    void sinkFailureIsReportedAsSinkException() throws Exception {
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv(panel(2, 5, 11), "\n")), false,
                UploadMode.REVISE, null, Map.of());
        SinkException e = assertThrows(SinkException.class, () -> new PanelUploadParser().parse(upload,
                new UploadFixtures.DecreasingIds(), cs -> {
                    throw new IllegalStateException("disk full");
                }, ProgressListener.NONE));
        assertEquals("disk full", e.getCause().getMessage());
    }

    @Test
    void interruptedThreadStopsTheParse() throws Exception {
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv(panel(30, 3000, 12), "\n")), false,
                UploadMode.REVISE, null, Map.of());
        Thread.currentThread().interrupt();
        try {
            assertThrows(java.io.InterruptedIOException.class,
                    () -> new PanelUploadParser().validate(upload, ProgressListener.NONE));
        } finally {
            Thread.interrupted();
        }
    }
}
