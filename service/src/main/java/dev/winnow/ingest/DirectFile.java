package dev.winnow.ingest;

import com.sun.nio.file.ExtendedOpenOption;

import java.io.IOException;
import java.io.InputStream;
import java.io.InterruptedIOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.channels.ClosedByInterruptException;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.OpenOption;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Objects;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Writes and reads spooled upload bodies past the operating system's page cache (Linux {@code O_DIRECT}, open(2)),
 * where the file system allows it, and through the page cache where it does not.
 *
 * <p>Why: a spooled body is written once, forced to disk before the upload is acknowledged, and read back once in
 * order (twice for files not in date blocks), so caching its pages gains nothing, and on the machine this was
 * measured on, filling the cache with new pages was most of the cost of an upload's receive. Writing 1.4 GB into new
 * page-cache pages took 0.5 to 3.5 s of kernel CPU time from run to run, and reading it back uncached through the
 * cache took 3.1 s. The same bytes written and read {@code O_DIRECT} took 0.35 and 0.13 s of kernel CPU at the disk's
 * pace (0.9 and 1.3 s). The durability is the same either way: {@link Output#finish} forces the file to disk, as
 * before, and a body is acknowledged only after that.
 *
 * <p>{@code O_DIRECT} transfers must start at file offsets, and be lengths, that are multiples of the file system's
 * block size, from memory aligned the same way. Both streams therefore move whole blocks through one aligned buffer
 * of {@value #BUFFER} bytes: the writer pads its last block with zeros and then truncates the file to the bytes
 * written; the reader's last read stops short at the end of the file. When the file system refuses {@code O_DIRECT}
 * (tmpfs on older kernels, some network and overlay file systems), at open or at any transfer, the stream goes on through
 * an ordinary channel from where it stood; the bytes are the same either way.
 *
 * <p>A transfer on an interrupted thread fails with {@link InterruptedIOException} (the channel is closed by then).
 * Not thread-safe. The aligned buffers are direct memory, freed only by the collector: at most {@value #POOLED} are
 * kept between streams for the next ones, and at most {@value #MAX_ALIGNED} exist at once; a stream opened while all
 * of them are in use (that many uploads at once) goes through the page cache with a {@value #HEAP_BUFFER}-byte buffer
 * on the heap, as the spool did before.
 */
public final class DirectFile {
    /** Bytes moved per transfer: a multiple of every supported block size. */
    static final int BUFFER = 1 << 20;
    /** The largest block size for which the buffers' alignment suffices. */
    private static final int MAX_BLOCK = 1 << 16;
    private static final int POOLED = 4;
    private static final BlockingQueue<ByteBuffer> POOL = new ArrayBlockingQueue<>(POOLED);
    /** Aligned buffers that may exist at once, pooled or in use. */
    static final int MAX_ALIGNED = 32;
    private static final AtomicInteger ALIGNED = new AtomicInteger();
    /** The buffer of a stream that found every aligned buffer in use. */
    private static final int HEAP_BUFFER = 1 << 16;

    private DirectFile() {
    }

    /**
     * Creates {@code file} (which must not exist) for writing.
     *
     * @throws IOException when the file cannot be created
     */
    public static Output create(Path file) throws IOException {
        return create(file, true);
    }

    /** As {@link #create(Path)}; {@code tryDirect} false goes through the page cache from the start (for tests). */
    static Output create(Path file, boolean tryDirect) throws IOException {
        return create(file, tryDirect, null);
    }

    /** As {@link #create(Path, boolean)}, moving bytes through {@code buffer} (not pooled) when it is not null (for tests). */
    static Output create(Path file, boolean tryDirect, ByteBuffer buffer) throws IOException {
        int block = tryDirect ? directBlock(file.toAbsolutePath().getParent()) : 0;
        return new Output(Transfer.open(file, block, buffer, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE));
    }

    /**
     * Opens {@code file} for reading from its start.
     *
     * @throws IOException when the file cannot be opened
     */
    public static InputStream open(Path file) throws IOException {
        return open(file, true);
    }

    /** As {@link #open(Path)}; {@code tryDirect} false goes through the page cache from the start (for tests). */
    static Input open(Path file, boolean tryDirect) throws IOException {
        return open(file, tryDirect, null);
    }

    /** As {@link #open(Path, boolean)}, moving bytes through {@code buffer} (not pooled) when it is not null (for tests). */
    static Input open(Path file, boolean tryDirect, ByteBuffer buffer) throws IOException {
        return new Input(Transfer.open(file, tryDirect ? directBlock(file) : 0, buffer, StandardOpenOption.READ));
    }

    /** The block size O_DIRECT transfers of files at {@code path} align to, or 0 when it cannot be used. */
    private static int directBlock(Path path) {
        try {
            long block = Files.getFileStore(path).getBlockSize();
            return block > 0 && block <= MAX_BLOCK && Long.bitCount(block) == 1 ? (int) block : 0;
        } catch (IOException | UnsupportedOperationException | SecurityException e) {
            return 0;
        }
    }

    /**
     * A channel closed because its thread was interrupted, reported as the interruption it is (the thread keeps its
     * interrupt status), not as a file that cannot be read or written.
     */
    private static InterruptedIOException interruption(ClosedByInterruptException e) {
        InterruptedIOException interrupted = new InterruptedIOException("the spool file transfer was interrupted");
        interrupted.initCause(e);
        return interrupted;
    }

    /**
     * What both streams hold: the file, its channel, the block size while it is used O_DIRECT (0 through the page
     * cache) and the pooled aligned buffer.
     */
    private static final class Transfer {
        final Path file;
        FileChannel channel;
        int block;
        ByteBuffer buffer;
        /** Whether the buffer is one of the aligned ones, given back at {@link #close}. */
        private final boolean pooled;

        private Transfer(Path file, FileChannel channel, int block, ByteBuffer buffer, boolean pooled) {
            this.file = file;
            this.channel = channel;
            this.block = block;
            this.buffer = buffer;
            this.pooled = pooled;
        }

        /**
         * Opens the file O_DIRECT when {@code block} is positive and the file system takes it, else through the cache;
         * bytes go through {@code given} when it is not null, else through an aligned buffer, else (all of them in use)
         * through a heap buffer and the cache.
         */
        static Transfer open(Path file, int block, ByteBuffer given, OpenOption... options) throws IOException {
            ByteBuffer buffer = given != null ? given.clear() : takeAligned();
            boolean aligned = given == null && buffer != null;
            if (buffer == null) {
                buffer = ByteBuffer.allocate(HEAP_BUFFER);
                block = 0;
            }
            try {
                FileChannel direct = block > 0 ? openDirect(file, options) : null;
                return direct != null ? new Transfer(file, direct, block, buffer, aligned)
                        : new Transfer(file, FileChannel.open(file, options), 0, buffer, aligned);
            } catch (IOException | RuntimeException e) {
                if (aligned) {
                    giveBack(buffer);
                }
                throw e;
            }
        }

        /** A pooled or new aligned buffer, or null when {@value #MAX_ALIGNED} exist or direct memory is short. */
        private static ByteBuffer takeAligned() {
            ByteBuffer pooled = POOL.poll();
            if (pooled != null) {
                return pooled.clear();
            }
            if (ALIGNED.incrementAndGet() > MAX_ALIGNED) {
                ALIGNED.decrementAndGet();
                return null;
            }
            try {
                return ByteBuffer.allocateDirect(BUFFER + MAX_BLOCK).alignedSlice(MAX_BLOCK).limit(BUFFER).slice();
            } catch (OutOfMemoryError directMemoryShort) {
                // allocateDirect's failure when -XX:MaxDirectMemorySize is reached; the heap is untouched
                ALIGNED.decrementAndGet();
                return null;
            }
        }

        private static void giveBack(ByteBuffer buffer) {
            if (!POOL.offer(buffer)) {
                ALIGNED.decrementAndGet(); // left to the collector
            }
        }

        /** The file opened O_DIRECT, or null when the platform or the file system refuses it. */
        private static FileChannel openDirect(Path file, OpenOption... options) throws IOException {
            OpenOption[] withDirect = java.util.Arrays.copyOf(options, options.length + 1);
            withDirect[options.length] = ExtendedOpenOption.DIRECT;
            try {
                return FileChannel.open(file, withDirect);
            } catch (java.nio.file.FileAlreadyExistsException exists) {
                throw exists;
            } catch (IOException | UnsupportedOperationException refused) {
                // Linux may have created the file before it refused O_DIRECT, and a file to be created new was not
                // there before this call
                if (java.util.Arrays.asList(options).contains(StandardOpenOption.CREATE_NEW)) {
                    Files.deleteIfExists(file);
                }
                return null;
            }
        }

        /** Goes on through the page cache from {@code position}: the file system refused an O_DIRECT transfer. */
        void throughCache(long position, OpenOption option) throws IOException {
            channel.close();
            channel = FileChannel.open(file, option);
            channel.position(position);
            block = 0;
        }

        void close() throws IOException {
            if (buffer != null && pooled) {
                giveBack(buffer);
            }
            buffer = null;
            channel.close();
        }
    }

    /**
     * A new file written in whole blocks. {@link #flush} writes nothing (a partial block cannot go out on its own);
     * {@link #finish} writes the rest and forces the file to disk; {@link #close} without {@link #finish} leaves a
     * file that may lack its last bytes, for the caller to delete.
     */
    public static final class Output extends OutputStream {
        private final Transfer t;
        /** Bytes accepted by {@link #write}. */
        private long written;
        /** Bytes of the file already on their way to disk (the buffer holds the rest). */
        private long stored;

        private Output(Transfer transfer) {
            this.t = transfer;
        }

        /** True while the file is written past the page cache. */
        public boolean direct() {
            return t.block > 0;
        }

        /** Bytes written so far. */
        public long size() {
            return written;
        }

        @Override
        public void write(int b) throws IOException {
            write(new byte[] {(byte) b}, 0, 1);
        }

        @Override
        public void write(byte[] b, int off, int len) throws IOException {
            Objects.checkFromIndexSize(off, len, b.length);
            ByteBuffer buffer = open(t);
            while (len > 0) {
                int n = Math.min(len, buffer.remaining());
                buffer.put(b, off, n);
                off += n;
                len -= n;
                written += n;
                if (!buffer.hasRemaining()) {
                    drain();
                }
            }
        }

        /** Does nothing: the buffered bytes go out in whole blocks, or at {@link #finish}. */
        @Override
        public void flush() {
        }

        /**
         * Writes what is buffered and forces the file, data and size, to disk.
         *
         * @throws IOException when the file cannot be written or forced
         */
        public void finish() throws IOException {
            ByteBuffer buffer = open(t);
            if (buffer.position() > 0) {
                int tail = t.block > 0 ? buffer.position() % t.block : 0;
                if (tail > 0) {
                    buffer.put(new byte[t.block - tail]);
                }
                drain();
                if (t.channel.size() > written) {
                    t.channel.truncate(written);
                }
            }
            t.channel.force(true);
        }

        private void drain() throws IOException {
            t.buffer.flip();
            try {
                writeAll();
            } catch (ClosedByInterruptException interrupted) {
                throw interruption(interrupted);
            } catch (IOException refused) {
                if (t.block == 0) {
                    throw refused;
                }
                // the file system took O_DIRECT at open but not for the transfer: the rest goes through the cache
                t.throughCache(stored + t.buffer.position(), StandardOpenOption.WRITE);
                writeAll();
            }
            stored += t.buffer.limit();
            t.buffer.clear();
        }

        private void writeAll() throws IOException {
            while (t.buffer.hasRemaining()) {
                t.channel.write(t.buffer);
            }
        }

        @Override
        public void close() throws IOException {
            t.close();
        }
    }

    /** A file read in order, in whole blocks. */
    static final class Input extends InputStream {
        private final Transfer t;
        /** The file offset of the buffer's end. */
        private long position;
        private boolean ended;

        private Input(Transfer transfer) {
            this.t = transfer;
            t.buffer.limit(0);
        }

        /** True while the file is read past the page cache. */
        boolean direct() {
            return t.block > 0;
        }

        @Override
        public int read() throws IOException {
            if (!fill()) {
                return -1;
            }
            return t.buffer.get() & 0xff;
        }

        @Override
        public int read(byte[] b, int off, int len) throws IOException {
            Objects.checkFromIndexSize(off, len, b.length);
            if (len == 0) {
                return 0;
            }
            if (!fill()) {
                return -1;
            }
            int n = Math.min(len, t.buffer.remaining());
            t.buffer.get(b, off, n);
            return n;
        }

        @Override
        public int available() {
            return t.buffer == null ? 0 : t.buffer.remaining();
        }

        /** Makes the buffer hold unread bytes; false at the end of the file. */
        private boolean fill() throws IOException {
            ByteBuffer buffer = open(t);
            if (buffer.hasRemaining()) {
                return true;
            }
            if (ended) {
                return false;
            }
            buffer.clear();
            while (buffer.hasRemaining()) {
                int n = readSome();
                if (n < 0) {
                    ended = true;
                    break;
                }
                position += n;
                if (t.block > 0 && position % t.block != 0) {
                    // a short O_DIRECT read: the end of the file, or a file system that reads less; the next read
                    // would start off a block boundary, so it goes through the cache
                    t.throughCache(position, StandardOpenOption.READ);
                }
            }
            buffer.flip();
            return buffer.hasRemaining();
        }

        private int readSome() throws IOException {
            try {
                return t.channel.read(t.buffer);
            } catch (ClosedByInterruptException interrupted) {
                throw interruption(interrupted);
            } catch (IOException refused) {
                if (t.block == 0) {
                    throw refused;
                }
                t.throughCache(position, StandardOpenOption.READ);
                return t.channel.read(t.buffer);
            }
        }

        @Override
        public void close() throws IOException {
            t.close();
        }
    }

    /** The transfer's buffer; fails once the stream is closed. */
    private static ByteBuffer open(Transfer t) throws IOException {
        if (t.buffer == null) {
            throw new IOException("the spool file is closed");
        }
        return t.buffer;
    }
}
