package dev.winnow.construct;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.Arrays;

/**
 * Everything needed to continue a build after its last processed grid date: which definition it belongs to, how
 * many grid dates were processed and the last of them, and the current holdings of every sub-portfolio (security
 * ids and drifted values, or none before the first formation). Values are kept as raw double bits so a resumed
 * build continues to the last bit. Immutable.
 *
 * <p>Byte layout (big-endian, {@link DataOutputStream}): magic "WNES", int version (1), int key length + UTF-8
 * construction key, int processed dates, long last date as epoch day (or {@link Long#MIN_VALUE}), int number of
 * sub-portfolios (-1 before the first formation), then per sub-portfolio int size, ids, raw double bits.
 */
public final class EngineState {
    private static final int MAGIC = 0x574E4553; // "WNES"
    private static final int VERSION = 1;
    private static final long NO_DATE = Long.MIN_VALUE;

    private final String definitionKey;
    private final int processedDates;
    private final LocalDate lastProcessedDate;
    private final int[][] ids;
    private final double[][] values;

    EngineState(String definitionKey, int processedDates, LocalDate lastProcessedDate, Holding[] holdings) {
        this(definitionKey, processedDates, lastProcessedDate,
                holdings == null ? null : Arrays.stream(holdings).map(Holding::idsCopy).toArray(int[][]::new),
                holdings == null ? null : Arrays.stream(holdings).map(Holding::valuesCopy).toArray(double[][]::new));
    }

    private EngineState(String definitionKey, int processedDates, LocalDate lastProcessedDate, int[][] ids,
                        double[][] values) {
        this.definitionKey = definitionKey;
        this.processedDates = processedDates;
        this.lastProcessedDate = lastProcessedDate;
        this.ids = ids;
        this.values = values;
    }

    /** The {@link FactorDefinition#constructionKey()} of the definition this state belongs to. */
    public String definitionKey() {
        return definitionKey;
    }

    /** Number of grid dates processed (the next build starts at this grid index). */
    public int processedDates() {
        return processedDates;
    }

    /** The last processed grid date; null when none was processed. */
    public LocalDate lastProcessedDate() {
        return lastProcessedDate;
    }

    /** Whether a formation has happened, i.e. the state holds a book (possibly with empty sub-portfolios). */
    public boolean hasHoldings() {
        return ids != null;
    }

    /** Fresh working copies of the held sub-portfolios; null before the first formation. */
    Holding[] holdings() {
        if (ids == null) {
            return null;
        }
        Holding[] holdings = new Holding[ids.length];
        for (int s = 0; s < ids.length; s++) {
            holdings[s] = new Holding(ids[s].clone(), values[s].clone());
        }
        return holdings;
    }

    public byte[] toBytes() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (DataOutputStream out = new DataOutputStream(bytes)) {
            out.writeInt(MAGIC);
            out.writeInt(VERSION);
            byte[] key = definitionKey.getBytes(StandardCharsets.UTF_8);
            out.writeInt(key.length);
            out.write(key);
            out.writeInt(processedDates);
            out.writeLong(lastProcessedDate == null ? NO_DATE : lastProcessedDate.toEpochDay());
            out.writeInt(ids == null ? -1 : ids.length);
            for (int s = 0; ids != null && s < ids.length; s++) {
                out.writeInt(ids[s].length);
                for (int id : ids[s]) {
                    out.writeInt(id);
                }
                for (double v : values[s]) {
                    out.writeLong(Double.doubleToRawLongBits(v));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return bytes.toByteArray();
    }

    /** Reads {@link #toBytes()} output; IllegalArgumentException when the bytes are not a state of this version. */
    public static EngineState fromBytes(byte[] data) {
        try (DataInputStream in = new DataInputStream(new ByteArrayInputStream(data))) {
            if (data.length < 8 || in.readInt() != MAGIC) {
                throw new IllegalArgumentException("not a construction engine state (bad header); rebuild from scratch");
            }
            int version = in.readInt();
            if (version != VERSION) {
                throw new IllegalArgumentException("construction engine state version " + version
                        + " is not supported (expected " + VERSION + "); rebuild from scratch");
            }
            String key = new String(in.readNBytes(readLength(in, 1)), StandardCharsets.UTF_8);
            int processed = in.readInt();
            if (processed < 0) {
                throw corrupt();
            }
            long epochDay = in.readLong();
            int subs = in.readInt();
            int[][] ids = subs < 0 ? null : new int[subs][];
            double[][] values = subs < 0 ? null : new double[subs][];
            for (int s = 0; s < subs; s++) {
                int size = readLength(in, Integer.BYTES + Long.BYTES);
                ids[s] = new int[size];
                values[s] = new double[size];
                for (int k = 0; k < size; k++) {
                    ids[s][k] = in.readInt();
                }
                for (int k = 0; k < size; k++) {
                    values[s][k] = Double.longBitsToDouble(in.readLong());
                }
            }
            if (in.read() != -1) {
                throw new IllegalArgumentException("construction engine state has trailing bytes; rebuild from scratch");
            }
            return new EngineState(key, processed, epochDay == NO_DATE ? null : LocalDate.ofEpochDay(epochDay), ids, values);
        } catch (IOException e) {
            throw new IllegalArgumentException("construction engine state is truncated; rebuild from scratch", e);
        }
    }

    /** A length field, checked against the bytes left so that corrupt input cannot allocate huge arrays. */
    private static int readLength(DataInputStream in, int bytesPerItem) throws IOException {
        int n = in.readInt();
        if (n < 0 || (long) n * bytesPerItem > in.available()) {
            throw corrupt();
        }
        return n;
    }

    private static IllegalArgumentException corrupt() {
        return new IllegalArgumentException("construction engine state is corrupt; rebuild from scratch");
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof EngineState other && Arrays.equals(toBytes(), other.toBytes());
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(toBytes());
    }

    @Override
    public String toString() {
        return "EngineState[processed=" + processedDates + ", last=" + lastProcessedDate
                + ", subPortfolios=" + (ids == null ? "none" : ids.length) + "]";
    }
}
