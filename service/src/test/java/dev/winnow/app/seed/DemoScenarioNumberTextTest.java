package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The generators' number text against the JDK's exact decimal arithmetic ({@link BigDecimal}) as reference. */
class DemoScenarioNumberTextTest {

    @Test
    void examplesReadAsPlainDecimals() {
        assertEquals("0.1", SignificantDigits.format(0.1, 8));
        assertEquals("1234.5", SignificantDigits.format(1234.5, 8));
        assertEquals("-3", SignificantDigits.format(-3.0, 8));
        assertEquals("123456790", SignificantDigits.format(123_456_789.0, 8));
        assertEquals("0.000000001", SignificantDigits.format(1e-9, 8));
        assertEquals("0.33333333", SignificantDigits.format(1.0 / 3.0, 8));
        assertEquals("10", SignificantDigits.format(9.9999999999, 8));
        assertEquals("0", SignificantDigits.format(-0.0, 8));
        assertEquals("", SignificantDigits.format(Double.NaN, 8));
    }

    @Test
    void infinityAndBadDigitCountsAreRejected() {
        assertThrows(IllegalArgumentException.class, () -> SignificantDigits.format(Double.POSITIVE_INFINITY, 8));
        assertThrows(IllegalArgumentException.class, () -> SignificantDigits.format(1.0, 0));
        assertThrows(IllegalArgumentException.class, () -> SignificantDigits.format(1.0, 16));
    }

    /**
     * Over many random magnitudes the text is the correctly rounded 8-digit decimal (BigDecimal, HALF_UP) or, where the
     * scaled double lands on a rounding tie, its neighbour one unit in the 8th digit away.
     */
    @Test
    void randomValuesMatchBigDecimalRoundingWithinOneUnitInTheLastDigit() {
        SplittableRandom random = new SplittableRandom(42);
        int exact = 0;
        int trials = 200_000;
        for (int i = 0; i < trials; i++) {
            double value = (random.nextBoolean() ? 1 : -1) * random.nextDouble() * Math.pow(10, random.nextInt(-12, 13));
            if (value == 0.0) {
                continue;
            }
            String ours = SignificantDigits.format(value, 8);
            BigDecimal reference = new BigDecimal(value).round(new MathContext(8, RoundingMode.HALF_UP));
            BigDecimal parsed = new BigDecimal(ours);
            assertTrue(!ours.contains("E") && parsed.stripTrailingZeros().precision() <= 8, ours);
            BigDecimal unit = BigDecimal.ONE.movePointLeft(8 - 1 - (reference.precision() - reference.scale() - 1));
            assertTrue(parsed.subtract(reference).abs().compareTo(unit) <= 0, value + " -> " + ours + " vs " + reference);
            if (parsed.compareTo(reference) == 0) {
                exact++;
            }
        }
        assertTrue(exact > trials * 0.999, "only " + exact + " of " + trials + " correctly rounded");
    }
}
