package dev.winnow.app.seed;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * Locale-independent decimal text for doubles with at most a given number of significant digits, in plain notation
 * (never an exponent), trailing zeros dropped: 0.012345679, 1234.5, -3. NaN is written as the empty string (a missing
 * CSV cell).
 *
 * <p>The fast path scales by an exact power of ten and rounds with {@link Math#round}; Java 17 arithmetic is strict
 * IEEE 754 and {@link StrictMath#log10} is fully specified, so the same value gives the same text on every JVM. The
 * text is the correctly rounded decimal except, rarely, in the last digit when the scaled product lands on a tie.
 */
public final class SignificantDigits {

    private static final double[] POW10 = new double[23];
    private static final long[] POW10_LONG = new long[19];

    static {
        double p = 1.0;
        for (int i = 0; i < POW10.length; i++) {
            POW10[i] = p; // 10^0..10^22 are exact doubles
            p *= 10.0;
        }
        long q = 1L;
        for (int i = 0; i < POW10_LONG.length; i++) {
            POW10_LONG[i] = q;
            q *= 10L;
        }
    }

    private SignificantDigits() {
    }

    /** The text of {@code value} with at most {@code digits} (1..15) significant digits; "" for NaN. */
    public static String format(double value, int digits) {
        StringBuilder out = new StringBuilder(24);
        append(out, value, digits);
        return out.toString();
    }

    /** Appends the text of {@code value} (see {@link #format}) to {@code out}. */
    public static void append(StringBuilder out, double value, int digits) {
        if (digits < 1 || digits > 15) {
            throw new IllegalArgumentException("digits must be between 1 and 15, got " + digits);
        }
        if (Double.isNaN(value)) {
            return;
        }
        if (Double.isInfinite(value)) {
            throw new IllegalArgumentException("cannot write an infinite value; pass NaN for a missing one");
        }
        if (value == 0.0) {
            out.append('0');
            return;
        }
        double magnitude = Math.abs(value);
        int decimals = digits - 1 - (int) StrictMath.floor(StrictMath.log10(magnitude));
        if (decimals > 22 || decimals < -22) {
            appendExact(out, value, digits);
            return;
        }
        long mantissa = scaled(magnitude, decimals);
        if (mantissa >= POW10_LONG[digits]) { // log10 rounded up across a power of ten
            decimals--;
            mantissa = scaled(magnitude, decimals);
        } else if (mantissa < POW10_LONG[digits - 1] && decimals < 22) {
            decimals++;
            mantissa = scaled(magnitude, decimals);
        }
        if (value < 0) {
            out.append('-');
        }
        appendScaled(out, mantissa, decimals);
    }

    private static long scaled(double magnitude, int decimals) {
        return Math.round(decimals >= 0 ? magnitude * POW10[decimals] : magnitude / POW10[-decimals]);
    }

    /** Writes mantissa * 10^-decimals in plain notation without trailing zeros after the point. */
    private static void appendScaled(StringBuilder out, long mantissa, int decimals) {
        while (decimals > 0 && mantissa % 10 == 0) {
            mantissa /= 10;
            decimals--;
        }
        String text = Long.toString(mantissa);
        if (decimals <= 0) {
            out.append(text);
            for (int i = 0; i < -decimals; i++) {
                out.append('0');
            }
            return;
        }
        int integerDigits = text.length() - decimals;
        if (integerDigits <= 0) {
            out.append("0.");
            for (int i = 0; i < -integerDigits; i++) {
                out.append('0');
            }
            out.append(text);
        } else {
            out.append(text, 0, integerDigits).append('.').append(text, integerDigits, text.length());
        }
    }

    private static void appendExact(StringBuilder out, double value, int digits) {
        BigDecimal rounded = new BigDecimal(value).round(new MathContext(digits, RoundingMode.HALF_UP));
        out.append(rounded.stripTrailingZeros().toPlainString());
    }
}
