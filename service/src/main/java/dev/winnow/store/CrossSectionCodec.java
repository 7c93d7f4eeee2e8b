package dev.winnow.store;

import dev.winnow.construct.CrossSection;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Binary form of one date's cross-section, stored as one slice row. Column-oriented and self-describing:
 * <pre>
 * int version(1) | int n | int[n] ids | double[n] returns | double[n] caps
 * int numberColumns | per column: name, double[n]
 * int labelColumns  | per column: name, int distinct, distinct strings, int[n] codes (-1 = missing)
 * </pre>
 * Strings are an int byte length followed by UTF-8 bytes. Doubles keep their raw bits, so a decoded slice is
 * identical to the one encoded (builds are reproducible to the last bit).
 */
public final class CrossSectionCodec {
    private static final int VERSION = 1;

    private CrossSectionCodec() {
    }

    public static byte[] encode(CrossSection cs) {
        int n = cs.size();
        List<byte[]> names = new ArrayList<>();
        int size = 4 + 4 + n * 4 + n * 16 + 4 + 4;
        for (String name : cs.numbers().keySet()) {
            byte[] b = name.getBytes(StandardCharsets.UTF_8);
            names.add(b);
            size += 4 + b.length + n * 8;
        }
        List<LabelColumn> labels = new ArrayList<>();
        for (Map.Entry<String, String[]> e : cs.labels().entrySet()) {
            LabelColumn column = LabelColumn.of(e.getKey(), e.getValue());
            labels.add(column);
            size += column.encodedSize();
        }
        ByteBuffer buf = ByteBuffer.allocate(size);
        buf.putInt(VERSION).putInt(n);
        for (int id : cs.securityIds()) {
            buf.putInt(id);
        }
        putDoubles(buf, cs.returns());
        putDoubles(buf, cs.marketCaps());
        buf.putInt(names.size());
        int i = 0;
        for (double[] values : cs.numbers().values()) {
            putBytes(buf, names.get(i++));
            putDoubles(buf, values);
        }
        buf.putInt(labels.size());
        for (LabelColumn column : labels) {
            column.write(buf);
        }
        return buf.array();
    }

    public static CrossSection decode(LocalDate date, byte[] payload) {
        return decode(date, payload, null);
    }

    /**
     * The slice with only the numeric and label columns {@code columns} names (ids, returns and market caps always),
     * or every column when {@code columns} is null; the others are skipped in the buffer without being built, and
     * read as absent (all missing) from the result.
     */
    public static CrossSection decode(LocalDate date, byte[] payload, PanelStore.Columns columns) {
        ByteBuffer buf = ByteBuffer.wrap(payload);
        int version = buf.getInt();
        if (version != VERSION) {
            throw new IllegalStateException("slice of " + date + " has unknown encoding version " + version);
        }
        int n = buf.getInt();
        int[] ids = new int[n];
        for (int i = 0; i < n; i++) {
            ids[i] = buf.getInt();
        }
        double[] returns = getDoubles(buf, n);
        double[] caps = getDoubles(buf, n);
        int numberCount = buf.getInt();
        Map<String, double[]> numbers = new LinkedHashMap<>();
        for (int c = 0; c < numberCount; c++) {
            String name = getString(buf);
            if (columns == null || columns.numbers().contains(name)) {
                numbers.put(name, getDoubles(buf, n));
            } else {
                buf.position(buf.position() + 8 * n);
            }
        }
        int labelCount = buf.getInt();
        Map<String, String[]> labels = new LinkedHashMap<>();
        for (int c = 0; c < labelCount; c++) {
            String name = getString(buf);
            int distinct = buf.getInt();
            if (columns != null && !columns.labels().contains(name)) {
                for (int d = 0; d < distinct; d++) {
                    int length = buf.getInt();
                    buf.position(buf.position() + length);
                }
                buf.position(buf.position() + 4 * n);
                continue;
            }
            String[] dictionary = new String[distinct];
            for (int d = 0; d < distinct; d++) {
                dictionary[d] = getString(buf);
            }
            String[] values = new String[n];
            for (int i = 0; i < n; i++) {
                int code = buf.getInt();
                values[i] = code < 0 ? null : dictionary[code];
            }
            labels.put(name, values);
        }
        return new CrossSection(date, ids, returns, caps, numbers, labels);
    }

    private static void putDoubles(ByteBuffer buf, double[] values) {
        for (double v : values) {
            buf.putLong(Double.doubleToRawLongBits(v));
        }
    }

    private static double[] getDoubles(ByteBuffer buf, int n) {
        double[] values = new double[n];
        for (int i = 0; i < n; i++) {
            values[i] = Double.longBitsToDouble(buf.getLong());
        }
        return values;
    }

    private static void putBytes(ByteBuffer buf, byte[] bytes) {
        buf.putInt(bytes.length).put(bytes);
    }

    private static String getString(ByteBuffer buf) {
        byte[] bytes = new byte[buf.getInt()];
        buf.get(bytes);
        return new String(bytes, StandardCharsets.UTF_8);
    }

    private record LabelColumn(byte[] name, List<byte[]> dictionary, int[] codes) {
        static LabelColumn of(String name, String[] values) {
            Map<String, Integer> index = new HashMap<>();
            List<byte[]> dictionary = new ArrayList<>();
            int[] codes = new int[values.length];
            for (int i = 0; i < values.length; i++) {
                String v = values[i];
                if (v == null) {
                    codes[i] = -1;
                    continue;
                }
                Integer code = index.get(v);
                if (code == null) {
                    code = dictionary.size();
                    index.put(v, code);
                    dictionary.add(v.getBytes(StandardCharsets.UTF_8));
                }
                codes[i] = code;
            }
            return new LabelColumn(name.getBytes(StandardCharsets.UTF_8), dictionary, codes);
        }

        int encodedSize() {
            int size = 4 + name.length + 4 + codes.length * 4;
            for (byte[] d : dictionary) {
                size += 4 + d.length;
            }
            return size;
        }

        void write(ByteBuffer buf) {
            putBytes(buf, name);
            buf.putInt(dictionary.size());
            for (byte[] d : dictionary) {
                putBytes(buf, d);
            }
            for (int code : codes) {
                buf.putInt(code);
            }
        }
    }
}
