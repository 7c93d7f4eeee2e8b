package dev.winnow.store;

/** Reads what {@link ByteSink} wrote, with bounds checks by the array itself. */
final class ByteSource {
    private final byte[] bytes;
    private int position;

    ByteSource(byte[] bytes, int position) {
        this.bytes = bytes;
        this.position = position;
    }

    byte[] array() {
        return bytes;
    }

    int position() {
        return position;
    }

    void position(int at) {
        if (at > bytes.length) {
            throw new IllegalStateException("encoded slice is truncated");
        }
        position = at;
    }

    byte get() {
        return bytes[position++];
    }

    int getInt() {
        int v = intAt(bytes, position);
        position += 4;
        return v;
    }

    long getLong() {
        long v = longAt(bytes, position);
        position += 8;
        return v;
    }

    int getVarint() {
        int v = 0;
        for (int shift = 0; ; shift += 7) {
            byte b = bytes[position++];
            v |= (b & 0x7F) << shift;
            if (b >= 0) {
                return v;
            }
            if (shift > 28) {
                throw new IllegalStateException("malformed varint in an encoded slice");
            }
        }
    }

    static int intAt(byte[] b, int at) {
        return ((b[at] & 0xff) << 24) | ((b[at + 1] & 0xff) << 16) | ((b[at + 2] & 0xff) << 8) | (b[at + 3] & 0xff);
    }

    static long longAt(byte[] b, int at) {
        return ((long) intAt(b, at) << 32) | (intAt(b, at + 4) & 0xFFFFFFFFL);
    }
}
