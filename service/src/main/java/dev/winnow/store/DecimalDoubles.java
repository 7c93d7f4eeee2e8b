package dev.winnow.store;

/**
 * Lossless compact form of a column of doubles that were mostly read from short decimals, in about four bytes a value
 * instead of eight.
 *
 * <p>A finite value v is written as a signed integer d and a decimal exponent e with |d| &lt; 2^27 and
 * -22 &lt;= e &lt;= 22, chosen so that the IEEE 754 quotient d / 10^e (for e &gt;= 0) or the product d * 10^-e (for
 * e &lt; 0) gives back exactly v's bits. Since d and 10^|e| are then exact doubles, that one correctly rounded
 * operation yields the double nearest to the decimal d x 10^-e (Clinger 1990, "How to read floating point numbers
 * accurately", PLDI; the same fast path {@code NumberCell} parses with), so every value parsed from a decimal with up to
 * eight significant digits (nine when they read below 134217728) is found. The encoder first tries the form the
 * parser read the value in, when it was handed one ({@link SliceDecimals}), else the exponents that give eight and nine
 * significant digits, and keeps a form only after decoding it and comparing all 64 bits; everything else
 * (more digits, negative zero, infinities, NaNs other than the canonical missing-value NaN, subnormals) is stored
 * as its raw bits, so decoding never changes a bit.
 *
 * <p>Block layout, after a one-byte mode: {@link #RAW}: n raw 8-byte values. {@link #DECIMAL}: the exponent base
 * b (one signed byte), the exception count x (4 bytes), n 4-byte words, x raw 8-byte values in row order. A word's top
 * four bits are a slot: 0..13 for exponent b + slot with the zig-zag form of d in the low 28 bits, 14 for the
 * missing value (canonical NaN), 15 for the next exception. The base is chosen so that the 14 exponents cover the
 * most values; the encoder picks whichever mode is smaller.
 */
final class DecimalDoubles {
    static final byte RAW = 0;
    static final byte DECIMAL = 1;

    private static final int SLOTS = 14;
    private static final int MISSING_SLOT = 14;
    private static final int EXCEPTION_SLOT = 15;
    static final int MAX_EXPONENT = 22;
    static final long SIGNIFICAND_LIMIT = 1L << 27;
    private static final long CANONICAL_NAN = Double.doubleToRawLongBits(Double.NaN);
    private static final double LOG10_2 = 0.30102999566398120;
    private static final double[] POW10 = new double[MAX_EXPONENT + 1];
    /** 10^k for k = -MAX_EXPONENT-1 .. MAX_EXPONENT+1 at index k + MAX_EXPONENT + 1, nearest doubles (for estimates). */
    private static final double[] POWERS = new double[2 * MAX_EXPONENT + 3];
    /** Exponents that cannot be used: a marker in the scratch array. */
    private static final int NO_EXPONENT = Integer.MIN_VALUE;

    static {
        double p = 1;
        for (int i = 0; i <= MAX_EXPONENT; i++) {
            POW10[i] = p; // exact: 10^22 < 2^53 * 2^22 and 5^22 < 2^53
            p *= 10;
        }
        for (int k = -MAX_EXPONENT - 1; k <= MAX_EXPONENT + 1; k++) {
            POWERS[k + MAX_EXPONENT + 1] = Double.parseDouble("1e" + k);
        }
    }

    private DecimalDoubles() {
    }

    /** Reusable scratch space of an encoder thread. */
    static final class Scratch {
        int[] exponents = new int[0];
        int[] significands = new int[0];

        void ensure(int n) {
            if (exponents.length < n) {
                exponents = new int[n];
                significands = new int[n];
            }
        }
    }

    /** Appends the block for {@code values[0..n)} to {@code out}. */
    static void encode(double[] values, int n, ByteSink out, Scratch scratch) {
        encode(values, null, n, out, scratch);
    }

    /**
     * Appends the block for {@code values[0..n)} to {@code out}, trying first the decimal forms the parser read
     * ({@code forms}, {@link SliceDecimals#of} words, may be null): a form is kept only when it gives back the value's
     * 64 bits, and moved to another exponent of the block's window by integer scaling when it falls outside (the same
     * rational number, so the same correctly rounded double); a value without a usable form is found by trial.
     */
    static void encode(double[] values, long[] forms, int n, ByteSink out, Scratch scratch) {
        scratch.ensure(n);
        int[] exponent = scratch.exponents;
        int[] significand = scratch.significands;
        int[] histogram = new int[2 * MAX_EXPONENT + 1];
        for (int i = 0; i < n; i++) {
            double v = values[i];
            long bits = Double.doubleToRawLongBits(v);
            exponent[i] = NO_EXPONENT;
            if (bits == CANONICAL_NAN) {
                continue;
            }
            if (bits == 0L) {
                exponent[i] = NO_EXPONENT + 1; // +0.0: any exponent decodes it
                significand[i] = 0;
                continue;
            }
            long form = forms == null ? SliceDecimals.NONE : forms[i];
            if (form != SliceDecimals.NONE) {
                int e = (int) (form >> 32);
                int d = (int) form;
                if (e >= -MAX_EXPONENT && e <= MAX_EXPONENT && d > -SIGNIFICAND_LIMIT && d < SIGNIFICAND_LIMIT
                        && Double.doubleToRawLongBits(valueOf(d, e)) == bits) {
                    exponent[i] = e;
                    significand[i] = d;
                    histogram[e + MAX_EXPONENT]++;
                    continue;
                }
            }
            long found = trial(v);
            if (found != SliceDecimals.NONE) {
                int e = (int) (found >> 32);
                exponent[i] = e;
                significand[i] = (int) found;
                histogram[e + MAX_EXPONENT]++;
            }
        }
        int base = bestBase(histogram);
        int exceptions = 0;
        for (int i = 0; i < n; i++) {
            int e = exponent[i];
            if (e == NO_EXPONENT + 1) {
                continue;
            }
            if (e == NO_EXPONENT) {
                if (Double.doubleToRawLongBits(values[i]) != CANONICAL_NAN) {
                    exceptions++;
                }
            } else if ((e < base || e >= base + SLOTS) && !moveIntoWindow(values[i], i, base, exponent, significand)) {
                exceptions++;
            }
        }
        if (4L * n + 8L * exceptions + 5 >= 8L * n) {
            out.put(RAW);
            int at = out.reserve(8 * n);
            byte[] b = out.array();
            for (int i = 0; i < n; i++, at += 8) {
                ByteSink.LONG.set(b, at, Double.doubleToRawLongBits(values[i]));
            }
            return;
        }
        out.put(DECIMAL);
        out.put((byte) base);
        out.putInt(exceptions);
        int at = out.reserve(4 * n + 8 * exceptions);
        byte[] b = out.array();
        int exceptionAt = at + 4 * n;
        for (int i = 0; i < n; i++, at += 4) {
            int e = exponent[i];
            int word;
            if (e == NO_EXPONENT + 1) {
                word = 0;
            } else if (e >= base && e < base + SLOTS) {
                int s = significand[i];
                word = ((e - base) << 28) | ((s << 1) ^ (s >> 31));
            } else if (e == NO_EXPONENT && Double.doubleToRawLongBits(values[i]) == CANONICAL_NAN) {
                word = MISSING_SLOT << 28;
            } else {
                word = EXCEPTION_SLOT << 28;
                ByteSink.LONG.set(b, exceptionAt, Double.doubleToRawLongBits(values[i]));
                exceptionAt += 8;
            }
            ByteSink.INT.set(b, at, word);
        }
    }

    /** d / 10^e for e &gt;= 0, d * 10^-e for e &lt; 0: what {@link #decode} computes for a word. */
    private static double valueOf(int d, int e) {
        return e >= 0 ? d / POW10[e] : d * POW10[-e];
    }

    /**
     * Moves the value at row i to an exponent in [base, base + SLOTS) when its significand can be scaled there
     * exactly (times or divided by a power of ten, staying below 2^27), or when trial finds one there; false otherwise.
     * The scaled form names the same rational number, and both forms are one correctly rounded IEEE operation on
     * exact operands, so they give the same double; it is checked anyway.
     */
    private static boolean moveIntoWindow(double v, int i, int base, int[] exponent, int[] significand) {
        int e = exponent[i];
        long d = significand[i];
        while (e < base && Math.abs(d) * 10 < SIGNIFICAND_LIMIT) {
            d *= 10;
            e++;
        }
        while (e >= base + SLOTS && d != 0 && d % 10 == 0) {
            d /= 10;
            e--;
        }
        long bits = Double.doubleToRawLongBits(v);
        if (e >= base && e < base + SLOTS && Double.doubleToRawLongBits(valueOf((int) d, e)) == bits) {
            exponent[i] = e;
            significand[i] = (int) d;
            return true;
        }
        long found = trial(v);
        int t = (int) (found >> 32);
        if (found != SliceDecimals.NONE && t >= base && t < base + SLOTS) {
            exponent[i] = t;
            significand[i] = (int) found;
            return true;
        }
        return false;
    }

    /**
     * The form (as {@link SliceDecimals#of} packs it: exponent e in the high word, signed significand in the low one)
     * with 8 or 9 significant digits that gives back exactly v, found by trial, or {@link SliceDecimals#NONE}.
     */
    private static long trial(double v) {
        double m = Math.abs(v);
        if (!(m >= Double.MIN_NORMAL) || m == Double.POSITIVE_INFINITY) {
            return SliceDecimals.NONE;
        }
        // p = floor(log10 m), from the binary exponent: at most one too low, corrected by one comparison
        int p = (int) Math.floor(Math.getExponent(m) * LOG10_2);
        if (p >= -MAX_EXPONENT - 2 && p <= MAX_EXPONENT && m >= POWERS[p + 1 + MAX_EXPONENT + 1]) {
            p++;
        }
        int e = 7 - p;
        long d = fit(m, e);
        if (d < 0) {
            e++;
            d = fit(m, e);
            if (d < 0) {
                e -= 2;
                d = fit(m, e);
            }
        }
        if (d < 0) {
            return SliceDecimals.NONE;
        }
        return ((long) e << 32) | ((v < 0 ? -d : d) & 0xFFFF_FFFFL);
    }

    /** The magnitude d &lt; 2^27 with d at exponent e giving back exactly m, or -1. */
    private static long fit(double m, int e) {
        if (e > MAX_EXPONENT || e < -MAX_EXPONENT) {
            return -1;
        }
        double scaled = e >= 0 ? m * POW10[e] : m / POW10[-e];
        if (!(scaled < SIGNIFICAND_LIMIT)) {
            return -1;
        }
        long d = (long) Math.rint(scaled);
        double back = e >= 0 ? d / POW10[e] : d * POW10[-e];
        return back == m ? d : -1;
    }

    /** The first of 14 consecutive exponents that cover the most values. */
    private static int bestBase(int[] histogram) {
        int best = 0;
        int bestCount = -1;
        for (int start = 0; start + SLOTS <= histogram.length; start++) {
            int count = 0;
            for (int k = start; k < start + SLOTS; k++) {
                count += histogram[k];
            }
            if (count > bestCount) {
                bestCount = count;
                best = start;
            }
        }
        return best - MAX_EXPONENT;
    }

    /**
     * Decodes the block at the reader's position into {@code out[0..n)}, leaving the reader after it. A value at
     * exponent e is d / 10^e for e &gt;= 0 and d x 10^-e for e &lt; 0, one correctly rounded operation either way
     * (IEEE 754-2019, clause 5.1, cited from memory: an operation is computed exactly, then rounded once; d and
     * 10^|e| are exact doubles). A block whose exponents are all e &gt;= 0 (the usual case) divides only; a block
     * with both kinds computes d x m / q with (m, q) = (1, 10^e) or (10^-e, 1), the same single rounding (multiplying
     * and dividing by one are exact), so the loop has no branch on the exponent's sign. Each word is one big-endian
     * int load.
     *
     * @throws IllegalStateException when the block is cut short or its mode is unknown
     */
    static void decode(ByteSource in, double[] out, int n) {
        byte mode = in.get();
        if (mode == RAW) {
            for (int i = 0; i < n; i++) {
                out[i] = Double.longBitsToDouble(in.getLong());
            }
            return;
        }
        if (mode != DECIMAL) {
            throw new IllegalStateException("unknown encoding " + mode + " of a number column");
        }
        int base = in.get();
        int exceptions = in.getInt();
        int wordsAt = in.position();
        int exceptionAt = wordsAt + 4 * n;
        byte[] b = in.array();
        if (exceptions < 0 || exceptionAt + 8L * exceptions > b.length) {
            throw new IllegalStateException("encoded slice is truncated");
        }
        // indexed by the word's top four bits; the missing and exception slots are never read
        double[] divisors = new double[16];
        double[] multipliers = new double[16];
        for (int s = 0; s < SLOTS; s++) {
            int e = base + s;
            divisors[s] = e >= 0 ? POW10[Math.min(e, MAX_EXPONENT)] : 1.0;
            multipliers[s] = e >= 0 ? 1.0 : POW10[Math.min(-e, MAX_EXPONENT)];
        }
        boolean divideOnly = base >= 0;
        int at = wordsAt;
        for (int i = 0; i < n; i++, at += 4) {
            int word = (int) ByteSink.INT.get(b, at);
            int slot = word >>> 28;
            if (slot < SLOTS) {
                int zz = word & 0x0FFFFFFF;
                double d = (zz >>> 1) ^ -(zz & 1);
                out[i] = divideOnly ? d / divisors[slot] : d * multipliers[slot] / divisors[slot];
            } else if (slot == MISSING_SLOT) {
                out[i] = Double.NaN;
            } else {
                out[i] = Double.longBitsToDouble(ByteSource.longAt(b, exceptionAt));
                exceptionAt += 8;
            }
        }
        in.position(wordsAt + 4 * n + 8 * exceptions);
    }

    /** Skips the block at the reader's position. */
    static void skip(ByteSource in, int n) {
        byte mode = in.get();
        if (mode == RAW) {
            in.position(in.position() + 8 * n);
            return;
        }
        in.get();
        int exceptions = in.getInt();
        in.position(in.position() + 4 * n + 8 * exceptions);
    }
}
