package dev.winnow.store;

/**
 * The decimal form in which a parser read a slice's numbers, handed to the encoder beside the doubles so that it need
 * not find that form again by trial ({@link DecimalDoubles}): per number column (returns, market caps, then the extra
 * number columns in the order of {@code CrossSection.numbers()}), one {@link #of packed} word per row, or
 * {@link #NONE} where the parser has none to offer. A column array may be null (no forms for it).
 *
 * <p>A form is only a hint: the encoder keeps it only after checking that it gives back the value's 64 bits, so a
 * wrong or missing form can cost space and time, never a bit.
 */
public record SliceDecimals(long[] returns, long[] marketCaps, long[][] numbers) {

    /** No decimal form for this value. */
    public static final long NONE = Long.MIN_VALUE;

    /**
     * The form of the decimal {@code significand} x 10^{@code power}, or {@link #NONE} when it cannot be stored as
     * one (|significand| at or above 2^27, or the power outside -22..22). The value it stands for is
     * significand / 10^-power for power &lt;= 0 and significand * 10^power for power &gt; 0, one IEEE operation on
     * exact operands (Clinger 1990; the fast path of the parser).
     */
    public static long of(long significand, int power) {
        if (significand <= -DecimalDoubles.SIGNIFICAND_LIMIT || significand >= DecimalDoubles.SIGNIFICAND_LIMIT
                || power < -DecimalDoubles.MAX_EXPONENT || power > DecimalDoubles.MAX_EXPONENT) {
            return NONE;
        }
        return ((long) -power << 32) | (significand & 0xFFFF_FFFFL);
    }
}
