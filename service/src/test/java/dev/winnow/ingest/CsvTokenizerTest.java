package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class CsvTokenizerTest {

    /** A record as read: its start line and its fields. */
    record Rec(long line, List<String> fields) {
    }

    private static List<Rec> read(InputStream in) throws IOException {
        CsvTokenizer csv = new CsvTokenizer(in);
        List<Rec> records = new ArrayList<>();
        while (csv.next()) {
            List<String> fields = new ArrayList<>();
            for (int i = 0; i < csv.fieldCount(); i++) {
                fields.add(csv.text(i));
            }
            records.add(new Rec(csv.recordLine(), fields));
        }
        return records;
    }

    private static List<Rec> read(String text) throws IOException {
        return read(new ByteArrayInputStream(text.getBytes(StandardCharsets.UTF_8)));
    }

    /** Hands out at most a few bytes per read, so records straddle every buffer boundary. */
    private static InputStream trickle(String text) {
        return new FilterInputStream(new ByteArrayInputStream(text.getBytes(StandardCharsets.UTF_8))) {
            private int call;

            @Override
            public int read(byte[] b, int off, int len) throws IOException {
                return super.read(b, off, Math.min(len, 1 + (call++ % 5)));
            }
        };
    }

    // RFC 4180 section 2, rule 1: each record on its own line, delimited by CRLF.
    @Test
    void rfc4180Rule1RecordsEndWithCrlf() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("aaa", "bbb", "ccc")), new Rec(2, List.of("zzz", "yyy", "xxx"))),
                read("aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n"));
    }

    // RFC 4180 section 2, rule 2: the last record may lack the ending line break.
    @Test
    void rfc4180Rule2LastLineBreakOptional() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("aaa", "bbb", "ccc")), new Rec(2, List.of("zzz", "yyy", "xxx"))),
                read("aaa,bbb,ccc\r\nzzz,yyy,xxx"));
    }

    // RFC 4180 section 2, rule 4: spaces are part of a field; the tokenizer keeps them (cells are trimmed later).
    @Test
    void rfc4180Rule4SpacesArePartOfAField() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("aaa", " bbb ", "ccc"))), read("aaa, bbb ,ccc"));
    }

    // RFC 4180 section 2, rule 5: fields may or may not be enclosed in double quotes.
    @Test
    void rfc4180Rule5OptionalQuotes() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("aaa", "bbb", "ccc")), new Rec(2, List.of("zzz", "yyy", "xxx"))),
                read("\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx"));
    }

    // RFC 4180 section 2, rule 6: fields with line breaks, double quotes and commas are enclosed in double quotes.
    @Test
    void rfc4180Rule6LineBreakInsideQuotes() throws IOException {
        List<Rec> records = read("\"aaa\",\"b\r\nbb\",\"ccc\"\r\nzzz,yyy,xxx");
        assertEquals(List.of(new Rec(1, List.of("aaa", "b\r\nbb", "ccc")), new Rec(3, List.of("zzz", "yyy", "xxx"))),
                records, "the second record starts on physical line 3");
    }

    // RFC 4180 section 2, rule 6: a comma inside a quoted field does not split it.
    @Test
    void rfc4180Rule6CommaInsideQuotes() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("Acme, Inc.", "x"))), read("\"Acme, Inc.\",x\n"));
    }

    // RFC 4180 section 2, rule 7: a double quote inside a quoted field is escaped by doubling it.
    @Test
    void rfc4180Rule7DoubledQuotes() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("aaa", "b\"bb", "ccc"))), read("\"aaa\",\"b\"\"bb\",\"ccc\""));
    }

    @Test
    void lfAndLoneCrEndRecordsAndCountLines() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("a")), new Rec(2, List.of("b")), new Rec(3, List.of("c")),
                new Rec(4, List.of("d"))), read("a\nb\rc\r\nd\n"));
    }

    @Test
    void lineBreaksInsideQuotesCountAsPhysicalLines() throws IOException {
        List<Rec> records = read("\"x\ny\rz\r\nw\",1\nnext,2\n");
        assertEquals("x\ny\rz\r\nw", records.get(0).fields().get(0));
        assertEquals(5, records.get(1).line());
    }

    @Test
    void emptyFieldsAndTrailingComma() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("", "", "")), new Rec(2, List.of("a", ""))), read(",,\na,\n"));
    }

    @Test
    void emptyQuotedFieldIsNotABlankLine() throws IOException {
        CsvTokenizer csv = new CsvTokenizer(new ByteArrayInputStream("\n\"\"\n".getBytes(StandardCharsets.UTF_8)));
        assertTrue(csv.next());
        assertTrue(csv.isBlankLine());
        assertTrue(csv.next());
        assertFalse(csv.isBlankLine());
        assertFalse(csv.next());
    }

    @Test
    void byteOrderMarkIsSkipped() throws IOException {
        assertEquals(List.of(new Rec(1, List.of("date", "x"))), read("\uFEFFdate,x\n"));
    }

    @Test
    void unterminatedQuoteIsFlaggedOnTheLastRecord() throws IOException {
        CsvTokenizer csv = new CsvTokenizer(new ByteArrayInputStream("a,b\nc,\"open\nmore\n".getBytes(StandardCharsets.UTF_8)));
        assertTrue(csv.next());
        assertFalse(csv.unterminatedQuote());
        assertTrue(csv.next());
        assertTrue(csv.unterminatedQuote());
        assertEquals(2, csv.recordLine());
        assertEquals(2, csv.fieldCount());
        assertEquals("open\nmore\n", csv.text(1));
        assertFalse(csv.next());
    }

    @Test
    void strayQuotesAreFlaggedWithTheirField() throws IOException {
        CsvTokenizer csv = new CsvTokenizer(new ByteArrayInputStream("a,b\"c,d\n\"x\"y,z\n".getBytes(StandardCharsets.UTF_8)));
        assertTrue(csv.next());
        assertEquals(1, csv.malformedField());
        assertEquals(3, csv.fieldCount());
        assertTrue(csv.next());
        assertEquals(0, csv.malformedField());
        assertEquals(2, csv.fieldCount());
    }

    @Test
    void recordsStraddlingBufferRefillsReadTheSame() throws IOException {
        String big = "x".repeat(200_000);
        String text = "\uFEFFh1,h2\r\n\"q\"\"uote\",\"multi\r\nline\"\r\n" + big + ",\"" + big + "\"\"\"\r\n"
                + "\"\",\r\nlast,\"\"\"\"";
        List<Rec> expected = List.of(
                new Rec(1, List.of("h1", "h2")),
                new Rec(2, List.of("q\"uote", "multi\r\nline")),
                new Rec(4, List.of(big, big + "\"")),
                new Rec(5, List.of("", "")),
                new Rec(6, List.of("last", "\"")));
        assertEquals(expected, read(text));
        assertEquals(expected, read(trickle(text)));
    }

    /** The in-place form (a chunk of an array) reads what the stream form reads, record for record and position. */
    @Test
    void inPlaceTokenizingAgreesWithTheStream() throws IOException {
        java.util.SplittableRandom random = new java.util.SplittableRandom(3);
        String[] pieces = {"a", "bc", "12345678", "0.0070677968", ",", ",", ",", "\n", "\r\n", "\r", "\"", "\"\"",
            "\"x,y\"", " ", "\uFEFF", "é", "SY00001", "2000-01-03", ""};
        for (int round = 0; round < 3000; round++) {
            StringBuilder text = new StringBuilder();
            int parts = random.nextInt(60);
            for (int i = 0; i < parts; i++) {
                text.append(pieces[random.nextInt(pieces.length)]);
            }
            byte[] bytes = text.toString().getBytes(StandardCharsets.UTF_8);
            int from = random.nextInt(5);
            byte[] padded = new byte[from + bytes.length + random.nextInt(9)];
            java.util.Arrays.fill(padded, (byte) ',');
            System.arraycopy(bytes, 0, padded, from, bytes.length);
            CsvTokenizer stream = new CsvTokenizer(new ByteArrayInputStream(bytes));
            CsvTokenizer inPlace = new CsvTokenizer(padded, from, bytes.length);
            while (true) {
                boolean more = stream.next();
                assertEquals(more, inPlace.next(), text.toString());
                if (!more) {
                    break;
                }
                assertEquals(stream.recordLine(), inPlace.recordLine(), text.toString());
                assertEquals(stream.fieldCount(), inPlace.fieldCount(), text.toString());
                for (int f = 0; f < stream.fieldCount(); f++) {
                    assertEquals(stream.text(f), inPlace.text(f), text.toString());
                }
                assertEquals(stream.malformedField(), inPlace.malformedField(), text.toString());
                assertEquals(stream.unterminatedQuote(), inPlace.unterminatedQuote(), text.toString());
                assertEquals(stream.position(), inPlace.position(), text.toString());
                assertEquals(stream.nextLine(), inPlace.nextLine(), text.toString());
            }
        }
    }

    @Test
    void overlongRecordInPlaceStopsToo() {
        byte[] text = ("a,\"" + "y".repeat(CsvTokenizer.MAX_RECORD_BYTES + 10)).getBytes(StandardCharsets.UTF_8);
        CsvTokenizer csv = new CsvTokenizer(text, 0, text.length);
        CsvTokenizer.RecordTooLongException e = assertThrows(CsvTokenizer.RecordTooLongException.class, csv::next);
        assertEquals(1, e.line());
    }

    @Test
    void overlongRecordStopsInsteadOfFillingMemory() {
        byte[] text = ("a,\"" + "y".repeat(CsvTokenizer.MAX_RECORD_BYTES + 10)).getBytes(StandardCharsets.UTF_8);
        CsvTokenizer csv = new CsvTokenizer(new ByteArrayInputStream(text));
        CsvTokenizer.RecordTooLongException e = assertThrows(CsvTokenizer.RecordTooLongException.class, csv::next);
        assertEquals(1, e.line());
    }
}
