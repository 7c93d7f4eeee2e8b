package dev.winnow.ingest;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** Reference for every check: the JDK's Double.parseDouble, which is correctly rounded (its javadoc, JLS 3.10.2). */
class EiselLemireTest {

    private static void assertSameAsJdkOrUndecided(long mantissa, int exp10, boolean negative) {
        double fast = EiselLemire.toDouble(mantissa, exp10, negative);
        if (Double.isNaN(fast)) {
            return;
        }
        String text = (negative ? "-" : "") + Long.toUnsignedString(mantissa) + "e" + exp10;
        assertEquals(Double.doubleToRawLongBits(Double.parseDouble(text)), Double.doubleToRawLongBits(fast), text);
    }

    @Test
    void randomMantissasOverTheWholeExponentRange() {
        Random random = new Random(11);
        int undecided = 0;
        int total = 1_000_000;
        for (int i = 0; i < total; i++) {
            long mantissa = random.nextLong() >>> random.nextInt(64);
            int exp10 = random.nextInt(348 + 348) - 348;
            assertSameAsJdkOrUndecided(mantissa, exp10, random.nextBoolean());
            if (Double.isNaN(EiselLemire.toDouble(mantissa, exp10, false))) {
                undecided++;
            }
        }
        // Undecided: subnormal or overflowing results (a sizeable share of exponents here) and rare ambiguous ones.
        assertTrue(undecided < total / 2, "undecided " + undecided);
    }

    @Test
    void seventeenDigitDecimalsInTheUsualRangeAreAlmostAlwaysDecided() {
        Random random = new Random(12);
        int undecided = 0;
        int total = 300_000;
        for (int i = 0; i < total; i++) {
            long mantissa = 10_000_000_000_000_000L + (long) (random.nextDouble() * 9e16);
            int exp10 = random.nextInt(60) - 40;
            assertSameAsJdkOrUndecided(mantissa, exp10, false);
            if (Double.isNaN(EiselLemire.toDouble(mantissa, exp10, false))) {
                undecided++;
            }
        }
        // Exactly representable products (e.g. 59848745722686360e-1) take the documented fallback.
        assertTrue(undecided < total / 100, "undecided " + undecided);
    }

    @Test
    void knownHardCases() {
        // Halfway and near-halfway values around 2^53 and the normal/subnormal boundary.
        assertSameAsJdkOrUndecided(9007199254740993L, 0, false);
        assertSameAsJdkOrUndecided(9007199254740995L, 0, false);
        assertSameAsJdkOrUndecided(22250738585072011L, -324, false);
        assertSameAsJdkOrUndecided(22250738585072014L, -324, false);
        assertSameAsJdkOrUndecided(17976931348623157L, 292, false);
        assertSameAsJdkOrUndecided(-1L, 0, false);
        assertSameAsJdkOrUndecided(-1L, -348, false);
        assertSameAsJdkOrUndecided(1L, 347, false);
        assertEquals(Double.doubleToRawLongBits(-0.0), Double.doubleToRawLongBits(EiselLemire.toDouble(0, 5, true)));
    }

    @Test
    void shortestRoundTripTextsParseBack() {
        Random random = new Random(13);
        for (int i = 0; i < 300_000; i++) {
            double x = random.nextInt(2) == 0 ? random.nextGaussian() * Math.pow(10, random.nextInt(40) - 20)
                    : Double.longBitsToDouble(random.nextLong());
            if (!Double.isFinite(x)) {
                continue;
            }
            String text = Double.toString(x);
            byte[] bytes = text.getBytes(java.nio.charset.StandardCharsets.US_ASCII);
            NumberCell cell = new NumberCell();
            assertEquals(NumberCell.Kind.NUMBER, cell.read(bytes, 0, bytes.length), text);
            assertEquals(Double.doubleToRawLongBits(x), Double.doubleToRawLongBits(cell.value()), text);
        }
    }
}
