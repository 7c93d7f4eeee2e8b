package dev.winnow.ingest;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * Spool files written and read in whole aligned blocks (O_DIRECT where the file system allows it) hold exactly the
 * bytes written, whatever the sizes of the writes and reads and wherever the body ends against a block or the
 * buffer; the checks compare with the JDK's own file reading ({@link Files#readAllBytes}).
 */
class DirectFileTest {

    private static final int BLOCK = 4_096;
    private static final int BUFFER = DirectFile.BUFFER;

    @TempDir
    Path dir;

    private static byte[] bytes(int size) {
        byte[] b = new byte[size];
        new Random(size).nextBytes(b);
        return b;
    }

    private static final int[] SIZES = {0, 1, BLOCK - 1, BLOCK, BLOCK + 1, BUFFER - 1, BUFFER, BUFFER + 1,
        2 * BUFFER + BLOCK + 17};

    @Test
    void writesAndReadsBackEveryByteThroughEitherPath() throws IOException {
        for (boolean tryDirect : new boolean[] {true, false}) {
            for (int size : SIZES) {
                byte[] body = bytes(size);
                Path file = dir.resolve(tryDirect + "-" + size);
                Random random = new Random(size);
                try (DirectFile.Output out = DirectFile.create(file, tryDirect)) {
                    for (int at = 0; at < size; ) {
                        int n = Math.min(size - at, 1 + random.nextInt(size > BUFFER ? 300_000 : 70_000));
                        out.write(body, at, n);
                        at += n;
                    }
                    assertEquals(size, out.size());
                    out.finish();
                }
                String what = (tryDirect ? "direct" : "cached") + " file of " + size + " bytes";
                assertEquals(size, Files.size(file), "size of the " + what);
                assertArrayEquals(body, Files.readAllBytes(file), "bytes of the " + what);
                assertArrayEquals(body, readInPieces(file, tryDirect, random), "bytes read back from the " + what);
            }
        }
    }

    private static byte[] readInPieces(Path file, boolean tryDirect, Random random) throws IOException {
        ByteArrayOutputStream back = new ByteArrayOutputStream();
        try (InputStream in = DirectFile.open(file, tryDirect)) {
            byte[] piece = new byte[200_000];
            for (int n; (n = in.read(piece, 0, 1 + random.nextInt(piece.length))) >= 0; ) {
                assertTrue(n > 0, "a read of at least one byte returns at least one byte before the end");
                back.write(piece, 0, n);
            }
            assertEquals(-1, in.read(), "the end stays the end");
            assertEquals(-1, in.read(piece, 0, 10));
            assertEquals(0, in.read(piece, 0, 0));
        }
        return back.toByteArray();
    }

    @Test
    void singleBytesAndTheEndOfAShortFile() throws IOException {
        byte[] body = bytes(BLOCK + 3);
        Path file = dir.resolve("short");
        try (DirectFile.Output out = DirectFile.create(file)) {
            for (byte b : body) {
                out.write(b);
            }
            out.finish();
        }
        try (InputStream in = DirectFile.open(file)) {
            for (int i = 0; i < body.length; i++) {
                assertEquals(body[i] & 0xff, in.read(), "byte " + i);
            }
            assertEquals(-1, in.read());
        }
    }

    @Test
    void theDirectPathStaysDirectWhereTheFileSystemTakesIt() throws IOException {
        Path file = dir.resolve("aligned");
        byte[] body = bytes(3 * BUFFER + BLOCK + 5);
        try (DirectFile.Output out = DirectFile.create(file, true)) {
            assumeTrue(out.direct(), "the temporary directory's file system refuses O_DIRECT");
            out.write(body, 0, body.length);
            out.finish();
            // a transfer the kernel refused (a misaligned offset, length or buffer) would have switched to the cache
            assertTrue(out.direct(), "every block, the padded last one included, was written O_DIRECT");
        }
        assertArrayEquals(body, Files.readAllBytes(file));
        try (DirectFile.Input in = DirectFile.open(file, true)) {
            assertTrue(in.direct());
            byte[] first = new byte[BUFFER];
            int n = in.read(first, 0, first.length);
            assertEquals(BUFFER, n, "one whole buffer at a time");
            assertTrue(in.direct(), "whole-buffer reads stay O_DIRECT");
        }
    }

    @Test
    void aTransferTheFileSystemRefusesGoesOnThroughTheCache() throws IOException {
        Path file = dir.resolve("refused");
        // a buffer 512 bytes off a block boundary: the kernel refuses O_DIRECT transfers from or into it (EINVAL)
        ByteBuffer misaligned = ByteBuffer.allocateDirect(BUFFER + 2 * 65_536).alignedSlice(65_536)
                .position(512).limit(512 + BUFFER).slice();
        byte[] body = bytes(2 * BUFFER + 77);
        try (DirectFile.Output out = DirectFile.create(file, true, misaligned)) {
            assumeTrue(out.direct(), "the temporary directory's file system refuses O_DIRECT at open");
            out.write(body, 0, body.length);
            out.finish();
            assertFalse(out.direct(), "the refused transfer switched the stream to the page cache");
        }
        assertArrayEquals(body, Files.readAllBytes(file), "every byte, those before and after the switch");
        try (DirectFile.Input in = DirectFile.open(file, true, misaligned)) {
            assertTrue(in.direct());
            ByteArrayOutputStream back = new ByteArrayOutputStream();
            byte[] piece = new byte[100_000];
            for (int n; (n = in.read(piece, 0, piece.length)) >= 0; ) {
                back.write(piece, 0, n);
            }
            assertFalse(in.direct(), "the refused read switched the stream to the page cache");
            assertArrayEquals(body, back.toByteArray());
        }
        // the foreign buffer was not pooled: the next stream is direct again
        try (DirectFile.Output out = DirectFile.create(dir.resolve("after"), true)) {
            out.write(body, 0, BUFFER);
            out.finish();
            assertTrue(out.direct());
        }
    }

    @Test
    void streamsBeyondTheAlignedBuffersGoThroughTheCache() throws IOException {
        byte[] body = bytes(BUFFER + BLOCK + 9);
        java.util.List<DirectFile.Output> open = new java.util.ArrayList<>();
        try {
            DirectFile.Output first = DirectFile.create(dir.resolve("many-0"), true);
            open.add(first);
            assumeTrue(first.direct(), "the temporary directory's file system refuses O_DIRECT at open");
            for (int i = 1; i <= DirectFile.MAX_ALIGNED; i++) {
                open.add(DirectFile.create(dir.resolve("many-" + i), true));
            }
            long direct = open.stream().filter(DirectFile.Output::direct).count();
            assertEquals(DirectFile.MAX_ALIGNED, direct, "as many direct streams at once as there are aligned buffers");
            for (DirectFile.Output out : open) {
                out.write(body, 0, body.length);
                out.finish();
            }
        } finally {
            for (DirectFile.Output out : open) {
                out.close();
            }
        }
        for (int i = 0; i <= DirectFile.MAX_ALIGNED; i++) {
            assertArrayEquals(body, Files.readAllBytes(dir.resolve("many-" + i)), "stream " + i + ", direct or not");
        }
        // the buffers of closed streams are pooled or forgotten, never still counted: as many direct streams again
        open.clear();
        try {
            for (int i = 0; i < DirectFile.MAX_ALIGNED; i++) {
                open.add(DirectFile.create(dir.resolve("again-" + i), true));
            }
            assertTrue(open.stream().allMatch(DirectFile.Output::direct), "the aligned buffers came back when closed");
        } finally {
            for (DirectFile.Output out : open) {
                out.close();
            }
        }
    }

    @Test
    void aTransferOnAnInterruptedThreadIsAnInterruption() throws IOException {
        Path file = dir.resolve("interrupted");
        try (DirectFile.Output out = DirectFile.create(file)) {
            out.write(bytes(BLOCK), 0, BLOCK);
            out.finish();
        }
        for (boolean tryDirect : new boolean[] {true, false}) {
            try (InputStream in = DirectFile.open(file, tryDirect)) {
                Thread.currentThread().interrupt();
                assertThrows(java.io.InterruptedIOException.class, () -> in.read(new byte[10], 0, 10));
                assertTrue(Thread.currentThread().isInterrupted(), "the thread keeps its interrupt status");
            } finally {
                Thread.interrupted();
            }
            try (DirectFile.Output out = DirectFile.create(dir.resolve("interrupted-" + tryDirect), tryDirect)) {
                out.write(bytes(BUFFER - 1), 0, BUFFER - 1);
                Thread.currentThread().interrupt();
                assertThrows(java.io.InterruptedIOException.class, () -> out.write(new byte[2], 0, 2));
            } finally {
                Thread.interrupted();
            }
        }
    }

    @Test
    void anExistingFileIsNotOverwritten() throws IOException {
        Path file = dir.resolve("taken");
        Files.write(file, new byte[] {1, 2, 3});
        assertThrows(FileAlreadyExistsException.class, () -> DirectFile.create(file));
        assertArrayEquals(new byte[] {1, 2, 3}, Files.readAllBytes(file));
    }

    @Test
    void closingWithoutFinishingLeavesTheFileToTheCaller() throws IOException {
        Path file = dir.resolve("abandoned");
        try (DirectFile.Output out = DirectFile.create(file)) {
            out.write(bytes(BUFFER + 10), 0, BUFFER + 10);
        }
        assertTrue(Files.size(file) <= BUFFER + 10, "no more than the bytes written");
        assertThrows(IOException.class, () -> {
            DirectFile.Output out = DirectFile.create(dir.resolve("closed"));
            out.close();
            out.write(new byte[1], 0, 1);
        });
    }
}
