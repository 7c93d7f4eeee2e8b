package dev.winnow.ingest;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * Shares one String per distinct UTF-8 byte sequence, looked up by the bytes themselves so that a text seen before
 * costs no allocation. Open addressing with linear probing; holds at most {@code capacityLimit} texts, after which
 * new texts are decoded but not kept. Not thread-safe.
 */
final class TextCache {

    private static final VarHandle LONG = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    private static final VarHandle INT = MethodHandles.byteArrayViewVarHandle(int[].class, ByteOrder.LITTLE_ENDIAN);

    private final int capacityLimit;
    private byte[][] keys = new byte[1024][];
    private String[] texts = new String[1024];
    private int[] hashes = new int[1024];
    private int[] indexes = new int[1024];
    private String[] byIndex = new String[64];
    private byte[][] keysByIndex = new byte[64][];
    private int size;

    TextCache(int capacityLimit) {
        this.capacityLimit = capacityLimit;
    }

    /**
     * A dense index (0, 1, 2, ... in order of first sight) of the text of bytes [s, e), or -1 past the capacity
     * limit; {@link #textAt} gives the text back.
     */
    int indexOf(byte[] b, int s, int e) {
        int hash = hash(b, s, e);
        int mask = keys.length - 1;
        int slot = hash & mask;
        for (byte[] key = keys[slot]; key != null; key = keys[slot]) {
            if (hashes[slot] == hash && equal(key, b, s, e)) {
                return indexes[slot];
            }
            slot = (slot + 1) & mask;
        }
        if (size >= capacityLimit) {
            return -1;
        }
        insert(slot, hash, b, s, e, new String(b, s, e - s, StandardCharsets.UTF_8));
        return size - 1;
    }

    /**
     * {@link #indexOf}, trying first the index {@code guess} (any int): a caller that can tell which text likely
     * comes next (the security after the last one, in a file that repeats the same securities in the same order)
     * skips hashing when it is right.
     */
    int indexOf(byte[] b, int s, int e, int guess) {
        if (guess >= 0 && guess < size && equal(keysByIndex[guess], b, s, e)) {
            return guess;
        }
        return indexOf(b, s, e);
    }

    /** Bytes [s, e) of b equal key (eight, then four bytes at a time: the keys are short). */
    private static boolean equal(byte[] key, byte[] b, int s, int e) {
        int length = key.length;
        if (length != e - s) {
            return false;
        }
        int i = 0;
        for (; i <= length - 8; i += 8) {
            if ((long) LONG.get(key, i) != (long) LONG.get(b, s + i)) {
                return false;
            }
        }
        if (i <= length - 4) {
            if ((int) INT.get(key, i) != (int) INT.get(b, s + i)) {
                return false;
            }
            i += 4;
        }
        for (; i < length; i++) {
            if (key[i] != b[s + i]) {
                return false;
            }
        }
        return true;
    }

    /** The text with the given {@link #indexOf} index. */
    String textAt(int index) {
        return byIndex[index];
    }

    /** Texts kept so far. */
    int size() {
        return size;
    }

    private void insert(int slot, int hash, byte[] b, int s, int e, String text) {
        keys[slot] = Arrays.copyOfRange(b, s, e);
        texts[slot] = text;
        hashes[slot] = hash;
        indexes[slot] = size;
        if (size == byIndex.length) {
            byIndex = Arrays.copyOf(byIndex, size * 2);
            keysByIndex = Arrays.copyOf(keysByIndex, size * 2);
        }
        byIndex[size] = text;
        keysByIndex[size] = keys[slot];
        if (++size * 2 > keys.length) {
            grow();
        }
    }

    /** The text of bytes [s, e). */
    String text(byte[] b, int s, int e) {
        int hash = hash(b, s, e);
        int mask = keys.length - 1;
        int slot = hash & mask;
        for (byte[] key = keys[slot]; key != null; key = keys[slot]) {
            if (hashes[slot] == hash && equal(key, b, s, e)) {
                return texts[slot];
            }
            slot = (slot + 1) & mask;
        }
        String text = new String(b, s, e - s, StandardCharsets.UTF_8);
        if (size < capacityLimit) {
            insert(slot, hash, b, s, e, text);
        }
        return text;
    }

    private static int hash(byte[] b, int s, int e) {
        int h = 1;
        for (int i = s; i < e; i++) {
            h = 31 * h + b[i];
        }
        return h ^ (h >>> 16);
    }

    private void grow() {
        byte[][] oldKeys = keys;
        String[] oldTexts = texts;
        int[] oldHashes = hashes;
        int[] oldIndexes = indexes;
        keys = new byte[oldKeys.length * 2][];
        texts = new String[keys.length];
        hashes = new int[keys.length];
        indexes = new int[keys.length];
        int mask = keys.length - 1;
        for (int i = 0; i < oldKeys.length; i++) {
            if (oldKeys[i] != null) {
                int slot = oldHashes[i] & mask;
                while (keys[slot] != null) {
                    slot = (slot + 1) & mask;
                }
                keys[slot] = oldKeys[i];
                texts[slot] = oldTexts[i];
                hashes[slot] = oldHashes[i];
                indexes[slot] = oldIndexes[i];
            }
        }
    }
}
