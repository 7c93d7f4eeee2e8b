package dev.winnow.ingest;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * Shares one String per distinct UTF-8 byte sequence, looked up by the bytes themselves so that a text seen before
 * costs no allocation. Open addressing with linear probing; holds at most {@code capacityLimit} texts, after which
 * new texts are decoded but not kept. Not thread-safe.
 */
final class TextCache {

    private final int capacityLimit;
    private byte[][] keys = new byte[1024][];
    private String[] texts = new String[1024];
    private int[] hashes = new int[1024];
    private int size;

    TextCache(int capacityLimit) {
        this.capacityLimit = capacityLimit;
    }

    /** The text of bytes [s, e). */
    String text(byte[] b, int s, int e) {
        int hash = hash(b, s, e);
        int mask = keys.length - 1;
        int slot = hash & mask;
        for (byte[] key = keys[slot]; key != null; key = keys[slot]) {
            if (hashes[slot] == hash && Arrays.equals(key, 0, key.length, b, s, e)) {
                return texts[slot];
            }
            slot = (slot + 1) & mask;
        }
        String text = new String(b, s, e - s, StandardCharsets.UTF_8);
        if (size < capacityLimit) {
            keys[slot] = Arrays.copyOfRange(b, s, e);
            texts[slot] = text;
            hashes[slot] = hash;
            if (++size * 2 > keys.length) {
                grow();
            }
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
        keys = new byte[oldKeys.length * 2][];
        texts = new String[keys.length];
        hashes = new int[keys.length];
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
            }
        }
    }
}
