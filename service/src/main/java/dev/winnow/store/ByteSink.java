package dev.winnow.store;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.util.Arrays;

/** A growable big-endian byte buffer for encoders. */
final class ByteSink {
    /** Big-endian int and long views of a byte array, for encoders writing into {@link #reserve reserved} room. */
    static final VarHandle INT = MethodHandles.byteArrayViewVarHandle(int[].class, ByteOrder.BIG_ENDIAN);
    static final VarHandle LONG = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.BIG_ENDIAN);

    private byte[] bytes;
    private int size;

    ByteSink(int capacity) {
        bytes = new byte[Math.max(16, capacity)];
    }

    int size() {
        return size;
    }

    byte[] toArray() {
        return Arrays.copyOf(bytes, size);
    }

    /**
     * Makes room for {@code length} more bytes and counts them written; returns where they start in {@link #array()},
     * which the caller fills (the array may change with the next call that writes).
     */
    int reserve(int length) {
        ensure(length);
        int at = size;
        size += length;
        return at;
    }

    /** The buffer itself: the first {@link #size()} bytes are what was written. */
    byte[] array() {
        return bytes;
    }

    void clear() {
        size = 0;
    }

    private void ensure(int more) {
        if (size + more > bytes.length) {
            bytes = Arrays.copyOf(bytes, Math.max(bytes.length * 2, size + more));
        }
    }

    void put(byte b) {
        ensure(1);
        bytes[size++] = b;
    }

    void putInt(int v) {
        ensure(4);
        bytes[size] = (byte) (v >>> 24);
        bytes[size + 1] = (byte) (v >>> 16);
        bytes[size + 2] = (byte) (v >>> 8);
        bytes[size + 3] = (byte) v;
        size += 4;
    }

    void putLong(long v) {
        putInt((int) (v >>> 32));
        putInt((int) v);
    }

    /** Unsigned LEB128: seven bits a byte, low groups first. */
    void putVarint(int v) {
        ensure(5);
        while ((v & ~0x7F) != 0) {
            bytes[size++] = (byte) ((v & 0x7F) | 0x80);
            v >>>= 7;
        }
        bytes[size++] = (byte) v;
    }

    void putBytes(byte[] b, int from, int length) {
        ensure(length);
        System.arraycopy(b, from, bytes, size, length);
        size += length;
    }

    /** Overwrites 4 bytes at an earlier position (for lengths known only after writing what they measure). */
    void setInt(int at, int v) {
        bytes[at] = (byte) (v >>> 24);
        bytes[at + 1] = (byte) (v >>> 16);
        bytes[at + 2] = (byte) (v >>> 8);
        bytes[at + 3] = (byte) v;
    }
}
