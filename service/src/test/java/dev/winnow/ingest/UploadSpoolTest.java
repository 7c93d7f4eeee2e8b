package dev.winnow.ingest;

import dev.winnow.store.Limits;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/**
 * The spool copies a body in whole buffers although the request stream returns a few kilobytes a read: the file must
 * hold the body byte for byte whatever the read sizes, and the size limit must still stop the copy and leave no file.
 */
class UploadSpoolTest {

    @TempDir
    Path dataDir;

    /** A stream that returns at most {@code maxRead} bytes a call, a varying amount (as a socket does). */
    private static InputStream trickle(byte[] body, int maxRead, long seed) {
        Random random = new Random(seed);
        return new ByteArrayInputStream(body) {
            @Override
            public synchronized int read(byte[] b, int off, int len) {
                return super.read(b, off, Math.min(len, 1 + random.nextInt(maxRead)));
            }
        };
    }

    private static byte[] body(int size) {
        byte[] body = new byte[size];
        new Random(size).nextBytes(body);
        return body;
    }

    @Test
    void spoolsTheBodyByteForByteWhateverTheReadSizes() throws IOException {
        UploadSpool spool = new UploadSpool(dataDir, new Limits(1L << 30, 0));
        // sizes around a file system block (4 KiB) and the spool file's 1 MiB buffer: empty, one byte, one short of,
        // exactly and one past whole blocks and buffers
        for (int size : new int[] {0, 1, 4_095, 4_096, 4_097, 65_536, (1 << 20) - 1, 1 << 20, (1 << 20) + 1, 2_500_003}) {
            for (int maxRead : new int[] {1, 8_192, 70_000}) {
                if (maxRead == 1 && size > 70_000 || maxRead == 8_192 && size > 1 << 20) {
                    continue;
                }
                byte[] body = body(size);
                UploadSpool.Spooled spooled = spool.write(trickle(body, maxRead, size + maxRead), size, false);
                assertEquals(size, spooled.size(), "size of a " + size + "-byte body read " + maxRead + " at most");
                assertArrayEquals(body, Files.readAllBytes(spool.resolve(spooled.relativePath())),
                        "bytes of a " + size + "-byte body read " + maxRead + " at most");
            }
        }
    }

    @Test
    void aBodyOverTheLimitIsStoppedAndLeavesNoFile() throws IOException {
        UploadSpool spool = new UploadSpool(dataDir, new Limits(100_000, 0));
        byte[] body = body(100_001);
        // no declared length, so only the count of bytes received can stop it
        assertThrows(UploadSpool.UploadTooLargeException.class, () -> spool.write(trickle(body, 8_192, 7), -1, false));
        try (var files = Files.list(dataDir.resolve("spool"))) {
            assertEquals(0, files.count(), "a refused upload leaves no file");
        }
        // one byte fewer is within the limit
        byte[] fits = body(100_000);
        UploadSpool.Spooled spooled = spool.write(trickle(fits, 8_192, 8), -1, false);
        assertArrayEquals(fits, Files.readAllBytes(spool.resolve(spooled.relativePath())));
    }
}
