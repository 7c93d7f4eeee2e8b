package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.CrossSection;
import dev.winnow.store.CrossSectionCodec;
import dev.winnow.store.SliceDecimals;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The decimal forms the parser hands to the slice encoder ({@link NumberCell#decimal()}, {@link SliceDecimals}):
 * whatever the text, a slice encoded with them decodes to exactly the double the JDK's {@link Double#parseDouble}
 * gives for that text (the outside reference), and a wrong form never changes a bit.
 */
class DecimalFormsTest {

    private static final LocalDate DATE = LocalDate.of(2024, 3, 28);

    /** Random plain decimals: 1 to 22 digits, the point anywhere or absent, leading zeros, a sign, an exponent. */
    private static String randomDecimal(SplittableRandom random) {
        StringBuilder digits = new StringBuilder();
        int length = 1 + random.nextInt(22);
        for (int i = 0; i < length; i++) {
            digits.append((char) ('0' + (i == 0 && random.nextInt(4) > 0 ? 1 + random.nextInt(9) : random.nextInt(10))));
        }
        if (random.nextInt(3) == 0) {
            digits.insert(0, "0".repeat(random.nextInt(6)));
        }
        int point = random.nextInt(digits.length() + 2) - 1;
        if (point >= 0) {
            digits.insert(point, '.');
            if (digits.charAt(0) == '.' && random.nextBoolean()) {
                digits.insert(0, '0');
            }
        }
        if (digits.toString().equals(".")) {
            digits.append('5');
        }
        String sign = switch (random.nextInt(4)) {
            case 0 -> "-";
            case 1 -> "+";
            default -> "";
        };
        String exponent = random.nextInt(3) == 0 ? (random.nextBoolean() ? "e" : "E") + (random.nextInt(61) - 30) : "";
        return sign + digits + exponent;
    }

    @Test
    void slicesEncodedWithTheParsersFormsDecodeToTheJdksDoubles() {
        SplittableRandom random = new SplittableRandom(20261202);
        NumberCell cell = new NumberCell();
        int withForm = 0;
        for (int round = 0; round < 300; round++) {
            int n = 1 + random.nextInt(300);
            double[][] columns = new double[3][n];
            long[][] forms = new long[3][n];
            for (int c = 0; c < 3; c++) {
                for (int i = 0; i < n; i++) {
                    String text = randomDecimal(random);
                    byte[] b = text.getBytes(StandardCharsets.US_ASCII);
                    assertEquals(NumberCell.Kind.NUMBER, cell.read(b, 0, b.length), text);
                    double jdk = Double.parseDouble(text);
                    assertEquals(Double.doubleToRawLongBits(jdk), Double.doubleToRawLongBits(cell.value()), text);
                    columns[c][i] = cell.value();
                    forms[c][i] = cell.decimal();
                    withForm += cell.decimal() == SliceDecimals.NONE ? 0 : 1;
                }
            }
            assertRoundTrip(columns, forms);
        }
        assertTrue(withForm > 20_000, "most short decimals have a form: " + withForm);
    }

    @Test
    void exportedDecimalsOfFixedPrecisionComeBackAndTakeNoMoreRoomThanWithoutForms() {
        SplittableRandom random = new SplittableRandom(5);
        NumberCell cell = new NumberCell();
        int n = 3000;
        double[][] columns = new double[3][n];
        long[][] forms = new long[3][n];
        for (int i = 0; i < n; i++) {
            String[] texts = {
                String.format(Locale.ROOT, "%.8g", 0.02 * random.nextGaussian()),
                String.format(Locale.ROOT, "%.8g", Math.exp(7 + 2 * random.nextGaussian())),
                i % 40 == 0 ? "" : String.format(Locale.ROOT, "%.4f", random.nextGaussian())};
            for (int c = 0; c < 3; c++) {
                byte[] b = texts[c].getBytes(StandardCharsets.US_ASCII);
                cell.read(b, 0, b.length);
                columns[c][i] = cell.value();
                forms[c][i] = cell.decimal();
            }
        }
        byte[] with = assertRoundTrip(columns, forms);
        byte[] without = CrossSectionCodec.encode(section(columns));
        assertTrue(with.length <= without.length, with.length + " bytes with forms, " + without.length + " without");
    }

    /** Forms that do not give the value back (random words, the form of another row) are ignored, never trusted. */
    @Test
    void wrongFormsChangeNoBit() {
        SplittableRandom random = new SplittableRandom(11);
        for (int round = 0; round < 200; round++) {
            int n = 1 + random.nextInt(200);
            double[][] columns = new double[3][n];
            long[][] forms = new long[3][n];
            for (int c = 0; c < 3; c++) {
                for (int i = 0; i < n; i++) {
                    columns[c][i] = switch (random.nextInt(4)) {
                        case 0 -> Double.longBitsToDouble(random.nextLong());
                        case 1 -> -0.0;
                        default -> Double.parseDouble(randomDecimal(random));
                    };
                    forms[c][i] = switch (random.nextInt(3)) {
                        case 0 -> random.nextLong();
                        case 1 -> SliceDecimals.of(random.nextInt(-(1 << 27) + 1, 1 << 27), random.nextInt(-22, 23));
                        default -> SliceDecimals.of(0, random.nextInt(-22, 23));
                    };
                }
            }
            assertRoundTrip(columns, forms);
        }
    }

    @Test
    void formsOutsideTheStoredRangeAreNone() {
        assertEquals(SliceDecimals.NONE, SliceDecimals.of(1L << 27, 0));
        assertEquals(SliceDecimals.NONE, SliceDecimals.of(-(1L << 27), 0));
        assertEquals(SliceDecimals.NONE, SliceDecimals.of(5, 23));
        assertEquals(SliceDecimals.NONE, SliceDecimals.of(5, -23));
        assertTrue(SliceDecimals.of((1L << 27) - 1, -22) != SliceDecimals.NONE);
        NumberCell cell = new NumberCell();
        byte[] b = "134217728".getBytes(StandardCharsets.US_ASCII);
        cell.read(b, 0, b.length);
        assertEquals(SliceDecimals.NONE, cell.decimal(), "2^27 needs more than the 27 bits a stored significand has");
    }

    private static byte[] assertRoundTrip(double[][] columns, long[][] forms) {
        CrossSection cs = section(columns);
        byte[] payload = CrossSectionCodec.encode(cs, new SliceDecimals(forms[0], forms[1], new long[][] {forms[2]}));
        CrossSection back = CrossSectionCodec.decode(DATE, payload);
        assertBits(columns[0], back.returns());
        assertBits(columns[1], back.marketCaps());
        assertBits(columns[2], back.numberColumn("x"));
        return payload;
    }

    private static CrossSection section(double[][] columns) {
        int n = columns[0].length;
        int[] ids = new int[n];
        for (int i = 0; i < n; i++) {
            ids[i] = 1 + i;
        }
        return new CrossSection(DATE, ids, columns[0], columns[1], Map.of("x", columns[2]), Map.of());
    }

    private static void assertBits(double[] expected, double[] actual) {
        for (int i = 0; i < expected.length; i++) {
            assertEquals(Double.doubleToRawLongBits(expected[i]), Double.doubleToRawLongBits(actual[i]),
                    "row " + i + ": " + expected[i] + " came back as " + actual[i]);
        }
    }
}
