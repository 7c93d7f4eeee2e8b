package dev.winnow.ingest;

import java.math.BigInteger;

/**
 * Correctly rounded conversion of w * 10^q to a double for a decimal mantissa w below 2^64, by the Eisel-Lemire
 * algorithm (D. Lemire, "Number Parsing at a Gigabyte per Second", Software: Practice and Experience 51(8), 2021,
 * section 5; the same steps as Go's strconv.eiselLemire64).
 *
 * <p>Formula: normalise w so its top bit is set, multiply it by a 128-bit truncation of 10^q scaled to [2^127, 2^128),
 * and keep the top 54 bits of the 192-bit product; the binary exponent is floor(q * log2(10)) + 63 + 1023 - (leading
 * zeros of w), with floor(q * log2(10)) computed as (217706 * q) >> 16. When the truncated product leaves the
 * rounding undecided (possible only in narrow cases the paper characterises), when the value is exactly halfway, or
 * when the result is subnormal, infinite or out of the table's range, the method returns NaN and the caller falls
 * back to {@link Double#parseDouble}.
 */
final class EiselLemire {

    private static final int MIN_EXP10 = -348;
    private static final int MAX_EXP10 = 347;
    /** For each q in [MIN_EXP10, MAX_EXP10]: floor(10^q * 2^k) for the k that puts it in [2^127, 2^128), hi then lo. */
    private static final long[] POWERS = powersOfTen();

    private EiselLemire() {
    }

    /**
     * The double nearest to mantissa * 10^exp10 (mantissa read as unsigned), or NaN when this method cannot decide
     * and the caller must use the slow path.
     */
    static double toDouble(long mantissa, int exp10, boolean negative) {
        if (mantissa == 0) {
            return negative ? -0.0 : 0.0;
        }
        if (exp10 < MIN_EXP10 || exp10 > MAX_EXP10) {
            return Double.NaN;
        }
        int leadingZeros = Long.numberOfLeadingZeros(mantissa);
        long w = mantissa << leadingZeros;
        long exp2 = ((217706L * exp10) >> 16) + 64 + 1023 - leadingZeros;
        int index = 2 * (exp10 - MIN_EXP10);
        long powerHi = POWERS[index];
        long powerLo = POWERS[index + 1];

        long xHi = unsignedMultiplyHigh(w, powerHi);
        long xLo = w * powerHi;
        if ((xHi & 0x1FF) == 0x1FF && Long.compareUnsigned(xLo + w, w) < 0) {
            long yHi = unsignedMultiplyHigh(w, powerLo);
            long yLo = w * powerLo;
            long mergedHi = xHi;
            long mergedLo = xLo + yHi;
            if (Long.compareUnsigned(mergedLo, xLo) < 0) {
                mergedHi++;
            }
            if ((mergedHi & 0x1FF) == 0x1FF && mergedLo + 1 == 0 && Long.compareUnsigned(yLo + w, w) < 0) {
                return Double.NaN;
            }
            xHi = mergedHi;
            xLo = mergedLo;
        }
        long msb = xHi >>> 63;
        long bits54 = xHi >>> (msb + 9);
        exp2 -= 1 ^ msb;
        if (xLo == 0 && (xHi & 0x1FF) == 0 && (bits54 & 3) == 1) {
            return Double.NaN;
        }
        bits54 += bits54 & 1;
        long bits53 = bits54 >>> 1;
        if ((bits53 >>> 53) > 0) {
            bits53 >>>= 1;
            exp2++;
        }
        if (exp2 <= 0 || exp2 >= 0x7FF) {
            return Double.NaN;
        }
        long raw = (exp2 << 52) | (bits53 & 0x000F_FFFF_FFFF_FFFFL);
        return Double.longBitsToDouble(negative ? raw | Long.MIN_VALUE : raw);
    }

    /** High 64 bits of the unsigned 128-bit product (Math.unsignedMultiplyHigh arrives only in Java 18). */
    private static long unsignedMultiplyHigh(long a, long b) {
        return Math.multiplyHigh(a, b) + ((a >> 63) & b) + ((b >> 63) & a);
    }

    private static long[] powersOfTen() {
        long[] table = new long[2 * (MAX_EXP10 - MIN_EXP10 + 1)];
        BigInteger ten = BigInteger.TEN;
        for (int q = MIN_EXP10; q <= MAX_EXP10; q++) {
            BigInteger scaled;
            if (q >= 0) {
                BigInteger power = ten.pow(q);
                int shift = power.bitLength() - 128;
                scaled = shift >= 0 ? power.shiftRight(shift) : power.shiftLeft(-shift);
            } else {
                BigInteger power = ten.pow(-q);
                scaled = BigInteger.ONE.shiftLeft(127 + power.bitLength()).divide(power);
            }
            int i = 2 * (q - MIN_EXP10);
            table[i] = scaled.shiftRight(64).longValue();
            table[i + 1] = scaled.longValue();
        }
        return table;
    }
}
