package dev.winnow.ingest;

import java.io.IOException;
import java.io.InputStream;
import java.util.zip.GZIPInputStream;

/** Opens the decompressed view of an upload stream. */
final class Gzip {

    private static final int BUFFER = 1 << 16;

    private Gzip() {
    }

    /** {@code raw} itself, or its gzip-decompressed view; closes {@code raw} when it is not gzip data. */
    static InputStream decompressedIf(boolean gzip, InputStream raw) throws IOException {
        if (!gzip) {
            return raw;
        }
        try {
            return new GZIPInputStream(raw, BUFFER);
        } catch (IOException notGzip) {
            raw.close();
            throw notGzip;
        }
    }
}
