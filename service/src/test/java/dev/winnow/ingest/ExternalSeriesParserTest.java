package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.stats.ReturnSeries;
import java.nio.file.Path;
import java.time.LocalDate;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ExternalSeriesParserTest {

    @TempDir
    Path dir;

    private SeriesParseResult parse(String csv) throws Exception {
        return new ExternalSeriesParser().parse(UploadFixtures.write(dir, csv), false, UploadMode.REVISE, null);
    }

    private static void assertSingleError(SeriesParseResult result, long line, String column, String fragment) {
        assertEquals(1, result.errors().size(), () -> result.errors().toString());
        UploadError error = result.errors().get(0);
        assertEquals(line, error.line(), error::toString);
        assertEquals(column, error.column(), error::toString);
        assertTrue(error.message().contains(fragment), error::toString);
        assertEquals(0, result.series().size(), "a rejected upload yields no series");
    }

    @Test
    void rowsInAnyOrderBecomeASortedSeries() throws Exception {
        SeriesParseResult result = parse("return,date\r\n0.02,2024-02-29\r\n\"-0.01\",2024-01-31\r\n0,2024-03-29\r\n");
        assertTrue(result.accepted(), () -> result.errors().toString());
        ReturnSeries series = result.series();
        assertArrayEquals(new LocalDate[] {LocalDate.of(2024, 1, 31), LocalDate.of(2024, 2, 29),
            LocalDate.of(2024, 3, 29)}, series.dates());
        assertArrayEquals(new double[] {-0.01, 0.02, 0.0}, series.values());
        assertEquals(3, result.rowsAccepted());
    }

    @Test
    void gzipWithByteOrderMark() throws Exception {
        Path file = UploadFixtures.writeGzip(dir, "\uFEFFdate,return\n2024-01-31,0.01\n");
        SeriesParseResult result = new ExternalSeriesParser().parse(file, true, UploadMode.APPEND, null);
        assertTrue(result.accepted(), () -> result.errors().toString());
        assertEquals(1, result.series().size());
    }

    @Test
    void duplicateDate() throws Exception {
        SeriesParseResult result = parse("date,return\n2024-01-31,0.01\n2024-02-29,0.01\n2024-01-31,0.02\n");
        assertSingleError(result, 4, "date", "date 2024-01-31 appears more than once (first at line 2)");
        assertEquals(1, result.rowsRejected());
    }

    @Test
    void returnProblems() throws Exception {
        SeriesParseResult result = parse("date,return\n2024-01-31,\n2024-02-29,-2\n2024-03-29,Inf\n2024-04-30,abc\n");
        assertEquals(4, result.errorCount());
        assertTrue(result.errors().get(0).message().contains("return is empty"));
        assertTrue(result.errors().get(1).message().contains("below -1"));
        assertTrue(result.errors().get(2).message().contains("not a finite number"));
        assertTrue(result.errors().get(3).message().contains("not a number"));
        for (int i = 0; i < 4; i++) {
            assertEquals(i + 2, result.errors().get(i).line());
            assertEquals("return", result.errors().get(i).column());
        }
        assertEquals(4, result.rowsRejected());
    }

    @Test
    void badDate() throws Exception {
        assertSingleError(parse("date,return\n31/01/2024,0.01\n"), 2, "date", "is not a date");
    }

    @Test
    void appendAfterTheLastDateOnly() throws Exception {
        Path file = UploadFixtures.write(dir, "date,return\n2024-01-31,0.01\n2024-02-29,0.01\n");
        SeriesParseResult append = new ExternalSeriesParser().parse(file, false, UploadMode.APPEND,
                LocalDate.of(2024, 1, 31));
        assertSingleError(append, 2, "date", "use mode=revise");
        assertTrue(new ExternalSeriesParser().parse(file, false, UploadMode.REVISE, LocalDate.of(2024, 1, 31))
                .accepted());
    }

    @Test
    void exactlyDateAndReturnColumns() throws Exception {
        SeriesParseResult result = parse("date,value,extra\n2024-01-31,0.01,x\n");
        assertEquals(3, result.errors().size());
        assertEquals("return", result.errors().get(0).column());
        assertTrue(result.errors().get(1).message().contains("unexpected column 'value'"));
        assertTrue(result.errors().get(2).message().contains("unexpected column 'extra'"));
    }

    @Test
    void emptyAndHeaderOnly() throws Exception {
        assertSingleError(parse(""), 1, null, "the upload is empty");
        assertSingleError(parse("date,return\n"), 2, null, "no data rows");
    }

    @Test
    void quotingProblems() throws Exception {
        assertSingleError(parse("date,return\n2024-01-31,0.01,\n"), 2, null, "the row has 3 fields");
        assertSingleError(parse("date,return\n2024-01-31,\"0.01\n"), 2, "return", "never closed");
    }
}
