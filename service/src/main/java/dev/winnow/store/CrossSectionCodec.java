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
import java.util.function.Predicate;

/**
 * Binary form of one date's cross-section, stored as one slice row. Column-oriented and self-describing; the first
 * int is the encoding version, and every version ever written stays readable.
 *
 * <p>Version 2 (written now), integers big-endian, "varint" unsigned LEB128:
 * <pre>
 * int 2 | varint n
 * ids: varint runs | per run: varint zig-zag(start - end of previous run), varint length   (ids strictly increase)
 * int length | returns block | int length | market caps block
 * varint numberColumns | per column: string name, int length, number block
 * varint labelColumns  | per column: string name, int length, label block
 * number block: see {@link DecimalDoubles} (lossless, about 4 bytes a value for short decimals)
 * label block:  varint distinct | distinct strings | byte width | n codes of width bits (0 = missing, k = k-th string)
 * </pre>
 * Strings are a varint byte length followed by UTF-8 bytes. Each column's length lets a reader skip the columns it
 * does not need ({@link #decode(LocalDate, byte[], Predicate)}).
 *
 * <p>Version 1 (stores written before): {@code int 1 | int n | int[n] ids | double[n] returns | double[n] caps |
 * int numberColumns | per column: name, double[n] | int labelColumns | per column: name, int distinct, distinct
 * strings, int[n] codes (-1 = missing)}, strings as an int byte length and UTF-8 bytes.
 *
 * <p>Both keep every double's raw bits, so a decoded slice is identical to the one encoded (builds are reproducible
 * to the last bit).
 */
public final class CrossSectionCodec {
    private static final int VERSION_1 = 1;
    private static final int VERSION = 2;

    private CrossSectionCodec() {
    }

    public static byte[] encode(CrossSection cs) {
        return encode(cs, null);
    }

    /**
     * Encodes the slice, trying first the decimal forms the parser read its numbers in ({@code decimals}, may be
     * null); the bytes decode to the same values either way.
     */
    public static byte[] encode(CrossSection cs, SliceDecimals decimals) {
        int n = cs.size();
        ByteSink out = new ByteSink(64 + n * 20);
        DecimalDoubles.Scratch scratch = new DecimalDoubles.Scratch();
        out.putInt(VERSION);
        out.putVarint(n);
        putIds(out, cs.securityIds());
        putNumbers(out, cs.returns(), decimals == null ? null : decimals.returns(), scratch);
        putNumbers(out, cs.marketCaps(), decimals == null ? null : decimals.marketCaps(), scratch);
        out.putVarint(cs.numbers().size());
        int column = 0;
        long[][] forms = decimals == null ? null : decimals.numbers();
        for (Map.Entry<String, double[]> e : cs.numbers().entrySet()) {
            putString(out, e.getKey());
            putNumbers(out, e.getValue(), forms == null || column >= forms.length ? null : forms[column], scratch);
            column++;
        }
        out.putVarint(cs.labels().size());
        for (Map.Entry<String, String[]> e : cs.labels().entrySet()) {
            putString(out, e.getKey());
            putLabels(out, e.getValue());
        }
        return out.toArray();
    }

    public static CrossSection decode(LocalDate date, byte[] payload) {
        return decode(date, payload, name -> true);
    }

    /**
     * Decodes the slice with only the extra columns {@code wanted} accepts (the ids, returns and market caps always);
     * the others read as absent, that is all missing.
     */
    public static CrossSection decode(LocalDate date, byte[] payload, Predicate<String> wanted) {
        int version = ByteSource.intAt(payload, 0);
        if (version == VERSION_1) {
            return decodeVersion1(date, payload);
        }
        if (version != VERSION) {
            throw new IllegalStateException("slice of " + date + " has unknown encoding version " + version);
        }
        ByteSource in = new ByteSource(payload, 4);
        int n = in.getVarint();
        int[] ids = getIds(in, n);
        double[] returns = getNumbers(in, n);
        double[] caps = getNumbers(in, n);
        int numberCount = in.getVarint();
        Map<String, double[]> numbers = new LinkedHashMap<>();
        for (int c = 0; c < numberCount; c++) {
            String name = getString(in);
            if (wanted.test(name)) {
                numbers.put(name, getNumbers(in, n));
            } else {
                in.position(in.getInt() + in.position());
            }
        }
        int labelCount = in.getVarint();
        Map<String, String[]> labels = new LinkedHashMap<>();
        for (int c = 0; c < labelCount; c++) {
            String name = getString(in);
            if (wanted.test(name)) {
                in.getInt();
                labels.put(name, getLabels(in, n));
            } else {
                in.position(in.getInt() + in.position());
            }
        }
        return new CrossSection(date, ids, returns, caps, numbers, labels);
    }

    private static void putIds(ByteSink out, int[] ids) {
        int runs = 0;
        for (int i = 0; i < ids.length; i++) {
            if (i == 0 || ids[i] != ids[i - 1] + 1) {
                runs++;
            }
        }
        out.putVarint(runs);
        long end = 0;
        for (int i = 0; i < ids.length; ) {
            int j = i + 1;
            while (j < ids.length && ids[j] == ids[j - 1] + 1) {
                j++;
            }
            long gap = ids[i] - end;
            out.putVarint((int) ((gap << 1) ^ (gap >> 63)));
            out.putVarint(j - i);
            end = (long) ids[j - 1] + 1;
            i = j;
        }
    }

    private static int[] getIds(ByteSource in, int n) {
        int[] ids = new int[n];
        int runs = in.getVarint();
        long end = 0;
        int k = 0;
        for (int r = 0; r < runs; r++) {
            int zz = in.getVarint();
            long gap = (zz >>> 1) ^ -(zz & 1);
            int length = in.getVarint();
            if (length > n - k) {
                throw new IllegalStateException("encoded slice holds more ids than rows");
            }
            long id = end + gap;
            for (int i = 0; i < length; i++) {
                ids[k++] = (int) (id + i);
            }
            end = id + length;
        }
        if (k != n) {
            throw new IllegalStateException("encoded slice holds " + k + " ids for " + n + " rows");
        }
        return ids;
    }

    private static void putNumbers(ByteSink out, double[] values, long[] forms, DecimalDoubles.Scratch scratch) {
        int lengthAt = out.size();
        out.putInt(0);
        DecimalDoubles.encode(values, forms != null && forms.length == values.length ? forms : null, values.length, out, scratch);
        out.setInt(lengthAt, out.size() - lengthAt - 4);
    }

    private static double[] getNumbers(ByteSource in, int n) {
        int length = in.getInt();
        int end = in.position() + length;
        double[] values = new double[n];
        DecimalDoubles.decode(in, values, n);
        if (in.position() != end) {
            throw new IllegalStateException("number column of an encoded slice has the wrong length");
        }
        return values;
    }

    private static void putLabels(ByteSink out, String[] values) {
        int lengthAt = out.size();
        out.putInt(0);
        Map<String, Integer> index = new HashMap<>();
        List<String> dictionary = new ArrayList<>();
        int[] codes = new int[values.length];
        for (int i = 0; i < values.length; i++) {
            String v = values[i];
            if (v != null) {
                Integer code = index.get(v);
                if (code == null) {
                    dictionary.add(v);
                    code = dictionary.size();
                    index.put(v, code);
                }
                codes[i] = code;
            }
        }
        out.putVarint(dictionary.size());
        for (String d : dictionary) {
            putString(out, d);
        }
        int width = 32 - Integer.numberOfLeadingZeros(dictionary.size());
        out.put((byte) width);
        long buffer = 0;
        int filled = 0;
        for (int code : codes) {
            buffer = (buffer << width) | code;
            filled += width;
            while (filled >= 8) {
                filled -= 8;
                out.put((byte) (buffer >>> filled));
            }
        }
        if (filled > 0) {
            out.put((byte) (buffer << (8 - filled)));
        }
        out.setInt(lengthAt, out.size() - lengthAt - 4);
    }

    private static String[] getLabels(ByteSource in, int n) {
        int distinct = in.getVarint();
        String[] dictionary = new String[distinct + 1];
        for (int d = 1; d <= distinct; d++) {
            dictionary[d] = getString(in);
        }
        int width = in.get();
        String[] values = new String[n];
        if (width == 0) {
            return values;
        }
        byte[] b = in.array();
        int at = in.position();
        long buffer = 0;
        int filled = 0;
        int mask = (1 << width) - 1;
        for (int i = 0; i < n; i++) {
            while (filled < width) {
                buffer = (buffer << 8) | (b[at++] & 0xff);
                filled += 8;
            }
            filled -= width;
            int code = (int) (buffer >>> filled) & mask;
            if (code > distinct) {
                throw new IllegalStateException("label code " + code + " beyond the slice's " + distinct + " labels");
            }
            values[i] = dictionary[code];
        }
        in.position(at);
        return values;
    }

    private static void putString(ByteSink out, String s) {
        byte[] b = s.getBytes(StandardCharsets.UTF_8);
        out.putVarint(b.length);
        out.putBytes(b, 0, b.length);
    }

    private static String getString(ByteSource in) {
        int length = in.getVarint();
        int at = in.position();
        in.position(at + length);
        return new String(in.array(), at, length, StandardCharsets.UTF_8);
    }

    private static CrossSection decodeVersion1(LocalDate date, byte[] payload) {
        ByteBuffer buf = ByteBuffer.wrap(payload);
        buf.getInt();
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
            numbers.put(name, getDoubles(buf, n));
        }
        int labelCount = buf.getInt();
        Map<String, String[]> labels = new LinkedHashMap<>();
        for (int c = 0; c < labelCount; c++) {
            String name = getString(buf);
            int distinct = buf.getInt();
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

    private static double[] getDoubles(ByteBuffer buf, int n) {
        double[] values = new double[n];
        for (int i = 0; i < n; i++) {
            values[i] = Double.longBitsToDouble(buf.getLong());
        }
        return values;
    }

    private static String getString(ByteBuffer buf) {
        byte[] bytes = new byte[buf.getInt()];
        buf.get(bytes);
        return new String(bytes, StandardCharsets.UTF_8);
    }
}
