package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Every upload problem is reported with the right line, column and a message that says what to fix. */
class PanelUploadErrorsTest {

    private static final String HEADER = "date,security,return,market_cap\n";

    @TempDir
    Path dir;

    private PanelParseResult parse(String csv) throws Exception {
        return parse(csv, UploadMode.REVISE, null, Map.of());
    }

    private PanelParseResult parse(String csv, UploadMode mode, LocalDate lastDate, Map<String, ColumnType> schema)
            throws Exception {
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, csv), false, mode, lastDate, schema);
        return new PanelUploadParser().parse(upload, new UploadFixtures.DecreasingIds(),
                new UploadFixtures.CollectingSink(), ProgressListener.NONE);
    }

    private static void assertSingleError(PanelParseResult result, long line, String column, String fragment) {
        assertEquals(1, result.errors().size(), () -> "errors: " + result.errors());
        assertError(result.errors().get(0), line, column, fragment);
        assertFalse(result.accepted());
    }

    private static void assertError(UploadError error, long line, String column, String fragment) {
        assertEquals(line, error.line(), error::toString);
        assertEquals(column, error.column(), error::toString);
        assertTrue(error.message().contains(fragment), () -> "message lacks '" + fragment + "': " + error.message());
    }

    @Test
    void missingRequiredColumns() throws Exception {
        PanelParseResult result = parse("date,ticker,ret\n2024-01-31,ACME,0.01\n");
        assertEquals(2, result.errorCount());
        assertError(result.errors().get(0), 1, "security", "required column 'security' is missing");
        assertError(result.errors().get(1), 1, "return", "required column 'return' is missing");
        assertEquals(0, result.rowsRead(), "a broken header ends the parse before the rows");
    }

    @Test
    void columnNameRules() throws Exception {
        String longest = "a" + "b".repeat(62);
        assertTrue(parse("date,security,return," + longest + "\n2024-01-31,A,0.01,1\n").accepted(),
                "63 characters is the longest name");
        PanelParseResult result = parse("date,security,return, ,2x,size,size,"
                + "a234567890123456789012345678901234567890123456789012345678901234\n");
        List<UploadError> errors = result.errors();
        assertEquals(4, errors.size(), errors::toString);
        assertError(errors.get(0), 1, null, "column 4 of the header has no name");
        assertError(errors.get(1), 1, "2x", "[A-Za-z_][A-Za-z0-9_]{0,62}");
        assertError(errors.get(2), 1, "size", "appears twice in the header (columns 6 and 7)");
        assertError(errors.get(3), 1, errors.get(3).column(), "is not allowed");
        assertEquals(64, errors.get(3).column().length(), "64 characters is one too many");
    }

    @Test
    void headerNamesAreTrimmed() throws Exception {
        PanelParseResult result = parse(" date , security ,return\n2024-01-31,ACME,0.01\n");
        assertTrue(result.accepted(), () -> result.errors().toString());
    }

    @Test
    void unparseableAndEmptyDates() throws Exception {
        PanelParseResult result = parse(HEADER + "2024-01-31,A,0.01,\n2024/01/31,B,0.01,\n2024-02-30,C,0.01,\n"
                + ",D,0.01,\n");
        assertEquals(3, result.errors().size());
        assertError(result.errors().get(0), 3, "date", "'2024/01/31' is not a date: write dates as yyyy-mm-dd");
        assertError(result.errors().get(1), 4, "date", "'2024-02-30' is not a date");
        assertError(result.errors().get(2), 5, "date", "date is empty");
        assertEquals(4, result.rowsRead());
        assertEquals(3, result.rowsRejected());
        assertEquals(1, result.rowsAccepted());
    }

    @Test
    void emptySecurity() throws Exception {
        assertSingleError(parse(HEADER + "2024-01-31,  ,0.01,\n"), 2, "security", "security is empty");
    }

    @Test
    void textInNumericColumns() throws Exception {
        PanelParseResult result = parse("date,security,return,market_cap,size\n"
                + "2024-01-31,A,1.2%,5,1\n2024-01-31,B,0.01,big,2\n2024-01-31,C,0.01,5,n/a\n",
                UploadMode.REVISE, null, Map.of("size", ColumnType.NUMBER));
        assertEquals(3, result.errors().size());
        assertError(result.errors().get(0), 2, "return", "'1.2%' is not a number");
        assertError(result.errors().get(1), 3, "market_cap", "'big' is not a number");
        assertError(result.errors().get(2), 4, "size", "'n/a' is not a number: size takes decimal numbers");
    }

    @Test
    void returnBelowMinusOne() throws Exception {
        PanelParseResult result = parse(HEADER + "2024-01-31,A,-1,\n2024-01-31,B,-1.0001,\n");
        assertSingleError(result, 3, "return", "return -1.0001 is below -1");
        assertEquals(1, result.rowsAccepted(), "a return of exactly -1 (a total loss) is allowed");
    }

    @Test
    void marketCapMustBePositive() throws Exception {
        PanelParseResult result = parse(HEADER + "2024-01-31,A,0.01,0\n2024-01-31,B,0.01,-3\n2024-01-31,C,0.01,\n");
        assertEquals(2, result.errors().size());
        assertError(result.errors().get(0), 2, "market_cap", "market_cap 0 must be greater than zero");
        assertError(result.errors().get(1), 3, "market_cap", "market_cap -3 must be greater than zero");
    }

    @Test
    void nanAndInfinityInNumericColumns() throws Exception {
        PanelParseResult result = parse("date,security,return,market_cap,size,beta\n"
                + "2024-01-31,A,NaN,1,1,0.5\n"
                + "2024-01-31,B,0.01,inf,1,0.5\n"
                + "2024-01-31,C,0.01,1,-Infinity,0.5\n"
                + "2024-01-31,D,0.01,1,1,nan\n"
                + "2024-01-31,E,0.01,1,1,1e999\n",
                UploadMode.REVISE, null, Map.of("size", ColumnType.NUMBER));
        List<UploadError> errors = result.errors();
        assertEquals(5, errors.size(), errors::toString);
        assertError(errors.get(0), 2, "return", "'NaN' is not a finite number");
        assertError(errors.get(1), 3, "market_cap", "'inf' is not a finite number");
        assertError(errors.get(2), 4, "size", "'-Infinity' is not a finite number");
        assertError(errors.get(3), 5, "beta", "'nan' is not a finite number");
        assertError(errors.get(4), 6, "beta", "'1e999' is not a finite number");
        assertEquals(ColumnType.NUMBER, result.newColumns().get("beta"));
        assertEquals(5, result.rowsRejected());
    }

    @Test
    void nanInANewColumnWithOtherTextIsALabel() throws Exception {
        PanelParseResult result = parse("date,security,return,rating\n"
                + "2024-01-31,A,0.01,NaN\n2024-01-31,B,0.01,AA\n");
        assertTrue(result.accepted(), () -> result.errors().toString());
        assertEquals(ColumnType.LABEL, result.newColumns().get("rating"));
    }

    @Test
    void rowWithDeferredAndImmediateErrorsIsRejectedOnce() throws Exception {
        PanelParseResult result = parse("date,security,return,beta\n"
                + "2024-01-31,A,bad,NaN\n2024-01-31,B,0.01,NaN\n2024-01-31,C,0.01,1.5\n");
        assertEquals(3, result.errorCount());
        assertError(result.errors().get(0), 2, "return", "'bad' is not a number");
        assertError(result.errors().get(1), 2, "beta", "not a finite number");
        assertError(result.errors().get(2), 3, "beta", "not a finite number");
        assertEquals(2, result.rowsRejected());
        assertEquals(1, result.rowsAccepted());
    }

    @Test
    void duplicateSecurityAtADate() throws Exception {
        PanelParseResult result = parse(HEADER + "2024-01-31,A,0.01,\n2024-01-31,B,0.02,\n2024-01-31,A,0.03,\n");
        assertSingleError(result, 4, "security", "security 'A' appears more than once at date 2024-01-31 (first at line 2)");
        assertEquals(1, result.rowsRejected());
        assertEquals(2, result.rowsAccepted());
    }

    @Test
    void duplicatesStopFurtherCrossSections() throws Exception {
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, HEADER
                + "2024-01-31,A,0.01,\n2024-02-29,A,0.01,\n2024-02-29,A,0.01,\n2024-03-29,A,0.01,\n"),
                false, UploadMode.REVISE, null, Map.of());
        PanelParseResult result = new PanelUploadParser().parse(upload, new UploadFixtures.DecreasingIds(), sink,
                ProgressListener.NONE);
        assertFalse(result.accepted());
        assertEquals(List.of(LocalDate.of(2024, 1, 31)), sink.received.stream().map(c -> c.date()).toList());
        assertEquals(1, result.rowsEmitted());
    }

    @Test
    void labelColumnWhoseValuesAreNowAllNumbers() throws Exception {
        PanelParseResult result = parse("date,security,return,sector\n2024-01-31,A,0.01,10\n2024-01-31,B,0.01,\n",
                UploadMode.REVISE, null, Map.of("sector", ColumnType.LABEL));
        assertSingleError(result, 1, "sector", "column 'sector' holds text labels in this panel");
        assertEquals(0, result.rowsRejected(), "a column-level problem rejects no row");
    }

    @Test
    void labelColumnWithSomeNumbersKeepsItsType() throws Exception {
        PanelParseResult result = parse("date,security,return,sector\n2024-01-31,A,0.01,10\n2024-01-31,B,0.01,Energy\n",
                UploadMode.REVISE, null, Map.of("sector", ColumnType.LABEL));
        assertTrue(result.accepted(), () -> result.errors().toString());
    }

    @Test
    void emptyFile() throws Exception {
        assertSingleError(parse(""), 1, null, "the upload is empty");
        assertSingleError(parse("\uFEFF"), 1, null, "the upload is empty");
        assertSingleError(parse("\n\n"), 1, null, "the upload is empty");
    }

    @Test
    void headerWithoutRows() throws Exception {
        PanelParseResult result = parse("date,security,return\n");
        assertSingleError(result, 2, null, "no data rows");
        assertEquals(0, result.rowsRead());
    }

    @Test
    void wrongNumberOfFields() throws Exception {
        PanelParseResult result = parse(HEADER + "2024-01-31,A,0.01\n2024-01-31,B,0.01,5,extra\n");
        assertEquals(2, result.errors().size());
        assertError(result.errors().get(0), 2, null, "the row has 3 fields but the header has 4");
        assertError(result.errors().get(1), 3, null, "the row has 5 fields but the header has 4");
    }

    @Test
    void unterminatedQuoteReportsTheLineWhereTheRecordStarts() throws Exception {
        PanelParseResult result = parse("date,security,return,name\n2024-01-31,A,0.01,ok\n"
                + "2024-01-31,B,0.01,\"Beta\n2024-01-31,C,0.01,x\n");
        assertSingleError(result, 3, "name", "never closed");
        assertEquals(2, result.rowsRead());
    }

    @Test
    void strayQuote() throws Exception {
        assertSingleError(parse("date,security,return,name\n2024-01-31,A,0.01,say \"hi\"\n"), 2, "name",
                "double quote inside a value");
    }

    @Test
    void invalidUtf8InText() throws Exception {
        byte[] bytes = "date,security,return\n2024-01-31,AB?,0.01\n".getBytes(StandardCharsets.US_ASCII);
        bytes[bytes.length - 8] = (byte) 0xC3;
        PanelUpload upload = new PanelUpload(UploadFixtures.writeBytes(dir, bytes, false), false, UploadMode.REVISE,
                null, Map.of());
        assertSingleError(new PanelUploadParser().validate(upload, ProgressListener.NONE), 2, "security",
                "not valid UTF-8");
    }

    @Test
    void notGzipWhenGzipIsDeclared() throws Exception {
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, HEADER + "2024-01-31,A,0.01,\n"), true,
                UploadMode.REVISE, null, Map.of());
        PanelParseResult result = new PanelUploadParser().validate(upload, ProgressListener.NONE);
        assertSingleError(result, 1, null, "not valid gzip data");
    }

    @Test
    void truncatedGzip() throws Exception {
        Path whole = UploadFixtures.writeGzip(dir, HEADER + "2024-01-31,A,0.01,\n".repeat(5000));
        byte[] bytes = java.nio.file.Files.readAllBytes(whole);
        Path cut = UploadFixtures.writeBytes(dir, java.util.Arrays.copyOf(bytes, bytes.length / 2), false);
        PanelParseResult result = new PanelUploadParser().validate(
                new PanelUpload(cut, true, UploadMode.REVISE, null, Map.of()), ProgressListener.NONE);
        assertFalse(result.accepted());
        assertTrue(result.errors().get(result.errors().size() - 1).message().contains("not valid gzip data"));
    }

    @Test
    void appendRejectsDatesUpToTheLastStoredDate() throws Exception {
        String csv = HEADER + "2024-01-31,A,0.01,\n2024-02-29,A,0.01,\n";
        LocalDate last = LocalDate.of(2024, 1, 31);
        PanelParseResult append = parse(csv, UploadMode.APPEND, last, Map.of());
        assertSingleError(append, 2, "date", "overlapping dates are an error");
        assertTrue(append.errors().get(0).message().contains("mode=revise"));
        assertTrue(parse(csv, UploadMode.APPEND, LocalDate.of(2023, 12, 29), Map.of()).accepted());
        assertTrue(parse(csv, UploadMode.APPEND, null, Map.of()).accepted(), "a new panel has no last date");
        assertTrue(parse(csv, UploadMode.REVISE, last, Map.of()).accepted(), "revise accepts any date");
    }

    @Test
    void firstHundredErrorsAreKeptAndAllAreCounted() throws Exception {
        StringBuilder csv = new StringBuilder(HEADER);
        for (int i = 0; i < 250; i++) {
            csv.append("2024-01-31,S").append(i).append(',').append(i % 2 == 0 ? "x" : "0.01").append(",\n");
        }
        PanelParseResult result = parse(csv.toString());
        assertEquals(100, result.errors().size());
        assertEquals(125, result.errorCount());
        assertEquals(250, result.rowsRead());
        assertEquals(125, result.rowsRejected());
        assertEquals(125, result.rowsAccepted());
        assertEquals(2, result.errors().get(0).line());
        assertEquals(200, result.errors().get(99).line());
    }

    @Test
    void deferredErrorsMergeIntoTheFirstHundredByLine() throws Exception {
        StringBuilder csv = new StringBuilder("date,security,return,beta\n2024-01-31,S,0.01,NaN\n");
        for (int i = 0; i < 150; i++) {
            csv.append("2024-01-31,T").append(i).append(",x,1\n");
        }
        PanelParseResult result = parse(csv.toString());
        assertEquals(151, result.errorCount());
        assertError(result.errors().get(0), 2, "beta", "not a finite number");
        assertEquals(100, result.errors().size());
        assertEquals(101, result.errors().get(99).line());
    }

    @Test
    void noSecondPassAfterErrors() throws Exception {
        UploadFixtures.CollectingSink sink = new UploadFixtures.CollectingSink();
        PanelUpload upload = new PanelUpload(UploadFixtures.write(dir, HEADER + "2024-01-31,A,x,\n"), false,
                UploadMode.REVISE, null, Map.of());
        PanelParseResult result = new PanelUploadParser().parse(upload, new UploadFixtures.DecreasingIds(), sink,
                ProgressListener.NONE);
        assertFalse(result.accepted());
        assertTrue(sink.received.isEmpty());
        assertEquals(-1, result.stats().distinctSecurities());
    }

    @Test
    void fixedColumnsInTheExistingSchemaAreRefused() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> new PanelUpload(dir, false, UploadMode.APPEND, null, Map.of("market_cap", ColumnType.NUMBER)));
        assertTrue(e.getMessage().contains("pass only the extra columns"));
    }

    @Test
    void ioFailureIsNotAnUploadError() {
        PanelUpload upload = new PanelUpload(dir.resolve("absent.csv"), false, UploadMode.REVISE, null, Map.of());
        org.junit.jupiter.api.Assertions.assertThrows(IOException.class,
                () -> new PanelUploadParser().validate(upload, ProgressListener.NONE));
    }
}
