package dev.winnow.store;

import dev.winnow.construct.LoadingsTable;

import java.nio.ByteBuffer;
import java.time.LocalDate;

/**
 * Binary form of one date's loadings, stored as one row. Column-oriented, big-endian:
 * <pre>
 * int version(1) | int m | int k | int minObs | int[m] ids | int[m] usable | double[m] alpha
 * | k x double[m] betas | double[m] rSquared | double[m] residualVol
 * </pre>
 * Doubles keep their raw bits, so a decoded table equals the encoded one bit for bit.
 */
public final class LoadingsCodec {
    private static final int VERSION = 1;
    private static final int HEADER = 16;

    private LoadingsCodec() {
    }

    public static byte[] encode(LoadingsTable t) {
        int m = t.size();
        int k = t.factorCount();
        ByteBuffer buf = ByteBuffer.allocate(HEADER + m * 8 + m * 8 * (k + 3));
        buf.putInt(VERSION).putInt(m).putInt(k).putInt(t.minObs());
        putInts(buf, t.securityIds());
        putInts(buf, t.usable());
        putDoubles(buf, t.alpha());
        for (double[] column : t.betas()) {
            putDoubles(buf, column);
        }
        putDoubles(buf, t.rSquared());
        putDoubles(buf, t.residualVol());
        return buf.array();
    }

    public static LoadingsTable decode(LocalDate date, long factorDigest, byte[] payload) {
        ByteBuffer buf = ByteBuffer.wrap(payload);
        int version = buf.getInt();
        if (version != VERSION) {
            throw new IllegalStateException("stored loadings of " + date + " have unknown encoding version " + version);
        }
        int m = buf.getInt();
        int k = buf.getInt();
        int minObs = buf.getInt();
        int[] ids = getInts(buf, m);
        int[] usable = getInts(buf, m);
        double[] alpha = getDoubles(buf, m);
        double[][] betas = new double[k][];
        for (int j = 0; j < k; j++) {
            betas[j] = getDoubles(buf, m);
        }
        double[] rSquared = getDoubles(buf, m);
        double[] residualVol = getDoubles(buf, m);
        return new LoadingsTable(date, minObs, ids, usable, alpha, betas, rSquared, residualVol, factorDigest);
    }

    private static void putInts(ByteBuffer buf, int[] values) {
        buf.asIntBuffer().put(values);
        buf.position(buf.position() + values.length * 4);
    }

    private static void putDoubles(ByteBuffer buf, double[] values) {
        for (double v : values) {
            buf.putLong(Double.doubleToRawLongBits(v));
        }
    }

    private static int[] getInts(ByteBuffer buf, int n) {
        int[] values = new int[n];
        buf.asIntBuffer().get(values);
        buf.position(buf.position() + n * 4);
        return values;
    }

    private static double[] getDoubles(ByteBuffer buf, int n) {
        double[] values = new double[n];
        for (int i = 0; i < n; i++) {
            values[i] = Double.longBitsToDouble(buf.getLong());
        }
        return values;
    }
}
