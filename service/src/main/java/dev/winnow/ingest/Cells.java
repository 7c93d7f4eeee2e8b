package dev.winnow.ingest;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;

/** Byte-level helpers for CSV cells: trimming spaces and tabs, ASCII comparison, UTF-8 checks. */
final class Cells {

    private static final VarHandle WORD = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    private Cells() {
    }

    static boolean isBlank(byte c) {
        return c == ' ' || c == '\t';
    }

    static int trimStart(byte[] b, int start, int end) {
        while (start < end && isBlank(b[start])) {
            start++;
        }
        return start;
    }

    static int trimEnd(byte[] b, int start, int end) {
        while (end > start && isBlank(b[end - 1])) {
            end--;
        }
        return end;
    }

    /** True when bytes [s, e) equal the lower-case ASCII word, ignoring ASCII case. */
    static boolean equalsIgnoreCase(byte[] b, int s, int e, String lowerWord) {
        if (e - s != lowerWord.length()) {
            return false;
        }
        for (int i = 0; i < lowerWord.length(); i++) {
            if ((b[s + i] | 0x20) != lowerWord.charAt(i)) {
                return false;
            }
        }
        return true;
    }

    /** The length in UTF-16 code units of well-formed UTF-8 bytes [s, e): a 4-byte sequence counts 2. */
    static int utf16Length(byte[] b, int s, int e) {
        int units = 0;
        for (int i = s; i < e; i++) {
            int c = b[i] & 0xff;
            if (c < 0x80 || c >= 0xc0) {
                units += c >= 0xf0 ? 2 : 1;
            }
        }
        return units;
    }

    /** True when bytes [s, e) are well-formed UTF-8. */
    static boolean isValidUtf8(byte[] b, int s, int e) {
        int i = s;
        while (i <= e - 8 && ((long) WORD.get(b, i) & 0x8080808080808080L) == 0) {
            i += 8; // eight ASCII bytes
        }
        while (i < e && b[i] >= 0) {
            i++;
        }
        if (i == e) {
            return true;
        }
        CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try {
            decoder.decode(ByteBuffer.wrap(b, i, e - i));
            return true;
        } catch (CharacterCodingException notUtf8) {
            return false;
        }
    }
}
