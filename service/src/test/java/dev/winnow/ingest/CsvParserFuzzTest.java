package dev.winnow.ingest;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.zip.GZIPOutputStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Bounded fuzz test of the panel and series CSV parsers (issue 14): random and mutated inputs from a fixed seed,
 * plain and gzip. Every input is either accepted (then the rows sent add up) or refused with at most 100 listed
 * problems, each with a line number and a message; no exception escapes. Memory stays bounded because inputs are
 * small and the parsers keep no rows beyond one date.
 *
 * <p>Run it longer with {@code mvn -q -B test -Dtest=CsvParserFuzzTest -Dwinnow.fuzz.cases=200000
 * -Dwinnow.fuzz.seed=7} (defaults: 3,000 cases, seed 14). A failure prints the seed and case number; the input is
 * written to {@code target/fuzz-failure.csv}.
 */
class CsvParserFuzzTest {
    static final long SEED = Long.getLong("winnow.fuzz.seed", 14);
    static final int CASES = Integer.getInteger("winnow.fuzz.cases", 3_000);

    private static final String[] SEEDS = {
            "date,security,return,market_cap,book_to_price,sector\n2024-01-31,ORCHID-LABS,0.0132,5120.5,0.41,health\n"
                    + "2024-01-31,PELLET-WORKS,-0.0217,830.0,,industrials\n2024-02-29,ORCHID-LABS,0.01,5200,0.4,health\n",
            "date,security,return\n2024-01-31,A,0.01\n2024-01-31,B,-0.02\n2024-02-29,A,0.03\n2024-02-29,B,1e-3\n",
            "date,security,return,score\n\"2024-01-31\",\"A,1\",0.01,\"1.5\"\n2024-01-31,\"B\"\"x\",0.02,NaN\n",
            "date,return\n2024-01-31,0.01\n2024-02-29,-0.003\n2024-03-28,0.002\n",
    };
    private static final String[] PIECES = {",", "\"", "\n", "\r\n", "\r", "", " ", "\t", "NaN", "Infinity", "-1.5",
            "1e400", "0x10", "2024-02-30", "2024-13-01", "9999-12-31", "0000-01-01", "é", "\u0000", "\uFFFD", "💹",
            "date", "security", "return", "market_cap", "-", "+", ".", "1e", "00012", "\"\"", "a\"b", "x".repeat(300)};

    @TempDir
    Path dir;

    @Test
    void theParsersAcceptOrRefuseEveryInputWithProblemsNeverAnException() throws IOException {
        SplittableRandom random = new SplittableRandom(SEED);
        for (int c = 0; c < CASES; c++) {
            byte[] input = input(random);
            boolean gzip = random.nextInt(5) == 0;
            byte[] sent = gzip && random.nextInt(3) > 0 ? gzip(input) : gzip ? mutate(random, gzip(input)) : input;
            Path file = dir.resolve("case.csv");
            Files.write(file, sent);
            boolean series = random.nextInt(4) == 0;
            UploadMode mode = random.nextBoolean() ? UploadMode.APPEND : UploadMode.REVISE;
            try {
                if (series) {
                    checkSeries(new ExternalSeriesParser().parse(file, gzip, mode, mode == UploadMode.APPEND ? LocalDate.of(2024, 1, 1) : null));
                } else {
                    checkPanel(file, gzip, mode);
                }
            } catch (Throwable e) {
                Files.write(Path.of("target", "fuzz-failure.csv"), sent);
                fail("seed " + SEED + ", case " + c + " (" + (series ? "series" : "panel") + (gzip ? ", gzip" : "")
                        + "): " + e + "; input in target/fuzz-failure.csv", e);
            }
        }
    }

    private void checkPanel(Path file, boolean gzip, UploadMode mode) throws Exception {
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        Map<String, ColumnType> schema = Map.of("sector", ColumnType.LABEL, "book_to_price", ColumnType.NUMBER);
        PanelParseResult r = new PanelUploadParser(3).parse(new PanelUpload(file, gzip, mode,
                mode == UploadMode.APPEND ? LocalDate.of(2023, 12, 31) : null, schema),
                new UploadFixtures.DecreasingIds(), sink, ProgressListener.NONE);
        assertProblemsWellFormed(r.accepted(), r.errors(), r.errorCount());
        if (r.accepted()) {
            assertEquals(r.rowsAccepted(), sink.received.stream().mapToLong(cs -> cs.size()).sum());
            assertEquals(r.dates().size(), sink.received.size());
        }
    }

    private static void checkSeries(SeriesParseResult r) {
        assertProblemsWellFormed(r.accepted(), r.errors(), r.errorCount());
        if (r.accepted()) {
            assertEquals(r.rowsAccepted(), r.series().size());
        }
    }

    private static void assertProblemsWellFormed(boolean accepted, java.util.List<UploadError> errors, long count) {
        assertEquals(accepted, errors.isEmpty(), errors::toString);
        assertTrue(errors.size() <= ErrorCollector.MAX_KEPT, "at most 100 problems are kept");
        assertTrue(count >= errors.size());
        for (UploadError e : errors) {
            assertTrue(e.line() >= 1, e::toString);
            assertFalse(e.message() == null || e.message().isBlank(), e::toString);
            assertTrue(e.message().length() < 1_000, "messages quote at most a short part of a cell: " + e.message().length());
        }
    }

    /** A seed mutated a few times, a random sequence of CSV-ish pieces, or random bytes. */
    static byte[] input(SplittableRandom random) {
        int kind = random.nextInt(10);
        if (kind < 6) {
            byte[] b = SEEDS[random.nextInt(SEEDS.length)].getBytes(StandardCharsets.UTF_8);
            int mutations = 1 + random.nextInt(6);
            for (int m = 0; m < mutations; m++) {
                b = mutate(random, b);
            }
            return b;
        }
        if (kind < 9) {
            StringBuilder s = new StringBuilder(random.nextBoolean() ? "date,security,return" : "date,return");
            int n = random.nextInt(60);
            for (int i = 0; i < n; i++) {
                s.append(PIECES[random.nextInt(PIECES.length)]);
            }
            return s.toString().getBytes(StandardCharsets.UTF_8);
        }
        byte[] b = new byte[random.nextInt(400)];
        for (int i = 0; i < b.length; i++) {
            b[i] = (byte) random.nextInt(256);
        }
        return b;
    }

    /** Replaces, inserts, deletes or duplicates a byte range, or splices in a piece. */
    static byte[] mutate(SplittableRandom random, byte[] b) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int at = b.length == 0 ? 0 : random.nextInt(b.length);
        int len = b.length == 0 ? 0 : Math.min(b.length - at, 1 + random.nextInt(8));
        out.write(b, 0, at);
        switch (random.nextInt(5)) {
            case 0 -> {
                for (int i = 0; i < len; i++) {
                    out.write(random.nextInt(256));
                }
                out.write(b, at + len, b.length - at - len);
            }
            case 1 -> {
                out.writeBytes(PIECES[random.nextInt(PIECES.length)].getBytes(StandardCharsets.UTF_8));
                out.write(b, at, b.length - at);
            }
            case 2 -> out.write(b, at + len, b.length - at - len);
            case 3 -> {
                out.write(b, at, len);
                out.write(b, at, b.length - at);
            }
            default -> {
                out.writeBytes(new byte[] {(byte) ",\"\n\r;\t ".charAt(random.nextInt(7))});
                out.write(b, at, b.length - at);
            }
        }
        return out.toByteArray();
    }

    static byte[] gzip(byte[] input) throws IOException {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(bytes)) {
            gz.write(input);
        }
        return bytes.toByteArray();
    }
}
