package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.Random;
import org.junit.jupiter.api.Test;

class NumberCellTest {

    private static NumberCell.Kind kind(String text) {
        byte[] b = text.getBytes(StandardCharsets.UTF_8);
        return new NumberCell().read(b, 0, b.length);
    }

    private static double value(String text) {
        byte[] b = text.getBytes(StandardCharsets.UTF_8);
        NumberCell cell = new NumberCell();
        cell.read(b, 0, b.length);
        return cell.value();
    }

    /** Reference: the JDK's Double.parseDouble, which the fast path must match bit for bit. */
    private static void assertSameAsJdk(String text) {
        assertEquals(NumberCell.Kind.NUMBER, kind(text), text);
        assertEquals(Double.doubleToRawLongBits(Double.parseDouble(text)), Double.doubleToRawLongBits(value(text)),
                text);
    }

    /** Eight bytes at once against the JDK's Long.parseLong, with non-digits (and bytes next to '0'..'9') anywhere. */
    @Test
    void eightDigitsAtOnceAgreeWithTheJdk() {
        Random random = new Random(8);
        byte[] near = {'/', ':', '0', '9', ' ', '.', (byte) 0xff, (byte) 0xc0, (byte) 0x3f, (byte) 0x40, (byte) 0xfa};
        for (int round = 0; round < 200_000; round++) {
            byte[] b = new byte[8];
            boolean digits = true;
            for (int i = 0; i < 8; i++) {
                b[i] = random.nextInt(20) == 0 ? near[random.nextInt(near.length)] : (byte) ('0' + random.nextInt(10));
                digits &= b[i] >= '0' && b[i] <= '9';
            }
            long expected = digits ? Long.parseLong(new String(b, StandardCharsets.ISO_8859_1)) : -1;
            assertEquals(expected, NumberCell.eightDigits(b, 0), new String(b, StandardCharsets.ISO_8859_1));
        }
    }

    @Test
    void matchesJdkParsingOnHandPickedDecimals() {
        for (String text : new String[] {"0", "-0", "+0.0", "1", "-1", "0.1", "0.2", "0.3", ".5", "5.", "1e3", "1E-3",
            "-1.5e+2", "123456789012345", "1234567890123456789", "0.000000000000000000001", "9007199254740993",
            "4.9e-324", "2.2250738585072014E-308", "1.7976931348623157e308", "0.30000000000000004",
            "123.456e-20", "00012.5000", "1e22", "1e23", "99700000000.000000", "9007199254740992000.0",
            "12345678901234567890000", "-0.000000000000000000000", "-0.0012345678901234567", "000.000123",
            "18446744073709551615", "18446744073709551616", "0.18446744073709551615e3", "3.14159265358979323846264338327950288"}) {
            assertSameAsJdk(text);
        }
    }

    @Test
    void matchesJdkParsingOnRandomDecimals() {
        Random random = new Random(20240328);
        for (int i = 0; i < 200_000; i++) {
            StringBuilder text = new StringBuilder();
            if (random.nextInt(3) == 0) {
                text.append(random.nextBoolean() ? '-' : '+');
            }
            int intDigits = random.nextInt(12);
            for (int d = 0; d < intDigits; d++) {
                text.append((char) ('0' + random.nextInt(10)));
            }
            int fracDigits = random.nextInt(20);
            if (intDigits == 0 && fracDigits == 0) {
                fracDigits = 1;
            }
            if (fracDigits > 0) {
                text.append('.');
                for (int d = 0; d < fracDigits; d++) {
                    text.append((char) ('0' + random.nextInt(10)));
                }
            }
            if (random.nextInt(4) == 0) {
                text.append(random.nextBoolean() ? 'e' : 'E').append(random.nextInt(61) - 30);
            }
            assertSameAsJdk(text.toString());
        }
    }

    @Test
    void cellsAreIndependent() {
        NumberCell cell = new NumberCell();
        byte[] first = "123456789".getBytes(StandardCharsets.US_ASCII);
        byte[] second = "0.5".getBytes(StandardCharsets.US_ASCII);
        cell.read(first, 0, first.length);
        cell.read(second, 0, second.length);
        assertEquals(0.5, cell.value());
    }

    @Test
    void nonFiniteLiteralsInAnyCaseAndOverflow() {
        for (String text : new String[] {"NaN", "nan", "-NAN", "Inf", "-inf", "+INF", "Infinity", "-infinity",
            "iNfInItY", "1e400", "-2e308"}) {
            assertEquals(NumberCell.Kind.NON_FINITE, kind(text), text);
        }
    }

    @Test
    void textIsNotANumber() {
        // Hexadecimal and the d/f type suffixes are accepted by Double.parseDouble but are text here by design.
        for (String text : new String[] {"abc", "0x1p3", "1.5d", "2f", "1e", "1e+", ".", "-", "+", "1.2.3", "1 000",
            "12%", "--1", "e5", "NaNa", "in"}) {
            assertEquals(NumberCell.Kind.TEXT, kind(text), text);
        }
    }

    @Test
    void emptyAndPaddedCells() {
        assertEquals(NumberCell.Kind.EMPTY, kind(""));
        assertEquals(NumberCell.Kind.EMPTY, kind(" \t "));
        assertEquals(1.5, value(" 1.5\t"));
        assertEquals(Double.NaN, value(""));
    }

    @Test
    void underflowIsZeroNotAnError() {
        assertEquals(NumberCell.Kind.NUMBER, kind("1e-400"));
        assertEquals(0.0, value("1e-400"));
    }
}
