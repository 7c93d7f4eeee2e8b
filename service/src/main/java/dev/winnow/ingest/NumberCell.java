package dev.winnow.ingest;

import dev.winnow.store.SliceDecimals;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;

/**
 * Reads a numeric cell from UTF-8 bytes. A number is a plain decimal: optional sign, digits with an optional decimal
 * point, optional exponent ({@code [+-]?(d+(.d*)?|.d+)([eE][+-]?d+)?}). The other forms {@link Double#parseDouble}
 * accepts (hexadecimal, the type suffixes d/f) are text here. {@code NaN}, {@code Inf} and {@code Infinity} in any
 * case and with an optional sign, and decimals too large for a double, are {@link Kind#NON_FINITE}.
 *
 * <p>Fast path (Clinger 1990, "How to read floating point numbers accurately", PLDI): when the digits form an
 * integer m below 2^53 and the decimal exponent e satisfies |e| <= 22, m and 10^|e| are exact doubles, so one IEEE
 * multiplication or division m * 10^e gives the correctly rounded value, identical to {@link Double#parseDouble}.
 * Trailing zeros of the digits are moved into the exponent first, so 99700000000.000000 takes the fast path too.
 * Up to 19 digits otherwise go through {@link EiselLemire}; what neither decides goes to {@link Double#parseDouble}.
 *
 * <p>A number read on the fast path with a significand below 2^27 also has its decimal form ({@link #decimal()}),
 * which the slice encoder can keep instead of finding it again.
 *
 * <p>Not thread-safe: {@link #kind()}, {@link #value()} and {@link #decimal()} describe the last cell read.
 */
final class NumberCell {

    enum Kind { EMPTY, NUMBER, NON_FINITE, TEXT }

    private static final double[] POWERS_OF_TEN = {
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
        1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
    private static final long EXACT_MANTISSA_LIMIT = 1L << 53;
    private static final int EXPONENT_CAP = 100_000;
    private static final int MAX_EXACT_DIGITS = 19;
    private static final VarHandle WORD = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    private Kind kind;
    private double value;
    private long decimal = SliceDecimals.NONE;
    private long accumulated;

    Kind kind() {
        return kind;
    }

    /** The number read, NaN unless {@link #kind()} is NUMBER. */
    double value() {
        return value;
    }

    /**
     * The decimal form of the number read ({@link SliceDecimals#of}: its significand and power of ten, which give the
     * value in one IEEE operation), or {@link SliceDecimals#NONE} when it was not read on the fast path or does not fit.
     */
    long decimal() {
        return decimal;
    }

    /** Reads bytes [start, end), ignoring surrounding spaces and tabs; returns the kind. */
    Kind read(byte[] b, int start, int end) {
        int s = Cells.trimStart(b, start, end);
        int e = Cells.trimEnd(b, s, end);
        value = Double.NaN;
        decimal = SliceDecimals.NONE;
        if (s == e) {
            return kind = Kind.EMPTY;
        }
        int i = s;
        boolean negative = false;
        if (b[i] == '-' || b[i] == '+') {
            negative = b[i] == '-';
            i++;
        }
        boolean anyDigit = false;
        while (i < e && b[i] == '0') {
            i++;
            anyDigit = true;
        }
        accumulated = 0;
        int significantStart = i;
        i = digitsInto(b, i, e);
        int significant = i - significantStart;
        int scale = 0;
        if (i < e && b[i] == '.') {
            int fractionStart = ++i;
            if (significant == 0) {
                while (i < e && b[i] == '0') {
                    i++;
                }
            }
            int fractionSignificantStart = i;
            i = digitsInto(b, i, e);
            significant += i - fractionSignificantStart;
            scale = i - fractionStart;
            anyDigit |= scale > 0;
        }
        anyDigit |= significant > 0;
        if (!anyDigit) {
            return kind = isNonFiniteWord(b, i, e) ? Kind.NON_FINITE : Kind.TEXT;
        }
        // Up to 19 significant digits fit an unsigned long exactly.
        long mantissa = accumulated;
        boolean exact = significant <= MAX_EXACT_DIGITS;
        int exponent = 0;
        if (i < e && (b[i] == 'e' || b[i] == 'E')) {
            i++;
            boolean negativeExponent = false;
            if (i < e && (b[i] == '-' || b[i] == '+')) {
                negativeExponent = b[i] == '-';
                i++;
            }
            int exponentStart = i;
            while (i < e && isDigit(b[i])) {
                exponent = Math.min(EXPONENT_CAP, exponent * 10 + (b[i++] - '0'));
            }
            if (i == exponentStart) {
                return kind = Kind.TEXT;
            }
            if (negativeExponent) {
                exponent = -exponent;
            }
        }
        if (i != e) {
            return kind = Kind.TEXT;
        }
        int power = exponent - scale;
        while (exact && mantissa >= EXACT_MANTISSA_LIMIT && mantissa % 10 == 0) {
            mantissa /= 10;
            power++;
        }
        double v = Double.NaN;
        if (exact && mantissa >= 0 && mantissa < EXACT_MANTISSA_LIMIT && Math.abs(power) <= 22) {
            v = power >= 0 ? mantissa * POWERS_OF_TEN[power] : mantissa / POWERS_OF_TEN[-power];
            v = negative ? -v : v;
            decimal = SliceDecimals.of(negative ? -mantissa : mantissa, power);
        } else if (exact) {
            v = EiselLemire.toDouble(mantissa, power, negative);
        }
        if (Double.isNaN(v)) {
            v = Double.parseDouble(new String(b, s, e - s, StandardCharsets.ISO_8859_1));
        }
        if (Double.isInfinite(v)) {
            return kind = Kind.NON_FINITE;
        }
        value = v;
        return kind = Kind.NUMBER;
    }

    /**
     * Appends the digits from i on to {@link #accumulated} (mod 2^64: exact for up to 19 significant digits), eight
     * at a time while it can; returns the index after the last digit.
     */
    private int digitsInto(byte[] b, int i, int e) {
        long m = accumulated;
        for (long eight; i <= e - 8 && (eight = eightDigits(b, i)) >= 0; i += 8) {
            m = m * 100_000_000L + eight;
        }
        for (int d; i < e && (d = b[i] - '0') >= 0 && d <= 9; i++) {
            m = m * 10 + d;
        }
        accumulated = m;
        return i;
    }

    /**
     * The value of the eight ASCII digits b[i..i+8), or -1 when they are not all digits: all bytes are tested at once
     * (each byte in 0x30..0x3F, and below 0x3A once 6 is added) and combined in three multiplications (D. Lemire,
     * "Number Parsing at a Gigabyte per Second", Software: Practice and Experience 51(8), 2021, section 6).
     */
    static long eightDigits(byte[] b, int i) {
        long w = (long) WORD.get(b, i);
        if ((w & 0xF0F0_F0F0_F0F0_F0F0L) != 0x3030_3030_3030_3030L
                || ((w + 0x0606_0606_0606_0606L) & 0xF0F0_F0F0_F0F0_F0F0L) != 0x3030_3030_3030_3030L) {
            return -1;
        }
        long v = w - 0x3030_3030_3030_3030L;
        v = v * 10 + (v >>> 8); // pairs of digits (the first digit is the lowest byte)
        return ((v & 0x0000_00FF_0000_00FFL) * (100 + (1_000_000L << 32))
                + ((v >>> 16) & 0x0000_00FF_0000_00FFL) * (1 + (10_000L << 32))) >>> 32;
    }

    private static boolean isDigit(byte c) {
        return c >= '0' && c <= '9';
    }

    /** nan, inf or infinity in any case (the sign was already consumed). */
    private static boolean isNonFiniteWord(byte[] b, int s, int e) {
        return Cells.equalsIgnoreCase(b, s, e, "nan")
                || Cells.equalsIgnoreCase(b, s, e, "inf")
                || Cells.equalsIgnoreCase(b, s, e, "infinity");
    }
}
