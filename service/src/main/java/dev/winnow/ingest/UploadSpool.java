package dev.winnow.ingest;

import dev.winnow.store.Limits;
import dev.winnow.store.SpoolStore;
import dev.winnow.store.StorageFaults;

import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.UUID;
import java.util.zip.GZIPInputStream;

/**
 * Upload bodies are written to disk and forced to stable storage before the job is queued and 202 is answered,
 * so an acknowledged upload survives a crash. They are written past the page cache where the file system allows it
 * ({@link DirectFile}), since each is read back once, in order.
 *
 * <p>Every upload is bounded ({@link Limits}): it is refused before a byte is written while the data directory's free
 * space is below {@code minFreeBytes} or would fall below it with the declared length, and stopped as soon as the
 * bytes received, or the decoded bytes of a gzip body, pass {@code maxUploadBytes}. A refused upload leaves no file.
 *
 * <p>On a shared store (PostgreSQL) a body that passed those checks is then copied into the database
 * ({@link SpoolStore}), committed before the 202, and the local file removed, so a worker on another machine can
 * read it without a shared file system; its reference is {@code db:<id>}. A job reads a body through
 * {@link #resolve}: a spooled file as it is, a stored body copied once to a local file of the job's instance,
 * which {@link #delete} removes with the body.
 */
public final class UploadSpool {
    private static final int BUFFER = 1 << 16;
    /** Free space is checked again after every this many bytes written. */
    private static final long SPACE_CHECK_EVERY = 16L << 20;

    private static final String STORED = "db:";
    /** How old an unreferenced stored body must be before start-up removes it: another instance may be queueing it. */
    private static final Duration STORED_ORPHAN_AGE = Duration.ofHours(1);

    private final Path dataDir;
    private final Path dir;
    private final Limits limits;
    private final SpoolStore store;

    public UploadSpool(Path dataDir) {
        this(dataDir, Limits.DEFAULTS);
    }

    public UploadSpool(Path dataDir, Limits limits) {
        this(dataDir, limits, null);
    }

    /** Bodies kept in the store when {@code store} is not null. */
    public UploadSpool(Path dataDir, Limits limits, SpoolStore store) {
        this.dataDir = dataDir;
        this.dir = dataDir.resolve("spool");
        this.limits = limits;
        this.store = store;
    }

    /** The upload passed {@link Limits#maxUploadBytes()}, counted as received or as decoded. */
    public static final class UploadTooLargeException extends RuntimeException {
        private final long limit;

        UploadTooLargeException(long limit, boolean decoded) {
            super("The upload is larger than the limit of " + Limits.describe(limit) + (decoded ? " once decompressed" : "")
                    + " (WINNOW_MAX_UPLOAD_BYTES); split it into several uploads (append one range of dates after another)"
                    + " or ask the operator to raise the limit.");
            this.limit = limit;
        }

        public long limit() {
            return limit;
        }
    }

    /** The data directory is too full, or cannot be written, to take the upload. */
    public static final class StorageFullException extends RuntimeException {
        StorageFullException(String message) {
            super(message);
        }
    }

    /** Copies the stream to a new spool file; returns its path relative to the data dir and its size. */
    public Spooled write(InputStream body) throws IOException {
        return write(body, -1, false);
    }

    /**
     * Copies the body to a new spool file within the limits and forces it to disk.
     *
     * @param declaredLength the request's Content-Length, or -1 when unknown
     * @param gzip           whether the body is gzip data; its decoded size is counted too
     * @throws UploadTooLargeException as soon as the limit is passed
     * @throws StorageFullException    when free space is short or the spool cannot be written
     * @throws IOException             when the body cannot be read (the client went away)
     */
    public Spooled write(InputStream body, long declaredLength, boolean gzip) throws IOException {
        if (declaredLength > limits.maxUploadBytes()) {
            throw new UploadTooLargeException(limits.maxUploadBytes(), false);
        }
        try {
            Files.createDirectories(dir);
        } catch (IOException e) {
            throw unwritable(e);
        }
        checkFreeSpace(Math.max(0, declaredLength));
        Path file = dir.resolve(UUID.randomUUID() + ".upload");
        boolean kept = false;
        try (DirectFile.Output out = openNew(file)) {
            Copy copy = new Copy(body, out);
            if (gzip) {
                copy.countDecoded();
            }
            copy.drain();
            try {
                out.finish();
            } catch (IOException e) {
                throw unwritable(e);
            }
            if (store != null) {
                String id = UUID.randomUUID().toString();
                try (InputStream local = DirectFile.open(file)) {
                    store.write(id, local);
                }
                return new Spooled(STORED + id, copy.written); // the local file goes in the finally block
            }
            kept = true;
            return new Spooled(dataDir.relativize(file).toString(), copy.written);
        } finally {
            if (!kept) {
                Files.deleteIfExists(file);
            }
        }
    }

    private DirectFile.Output openNew(Path file) {
        try {
            return DirectFile.create(file);
        } catch (IOException e) {
            throw unwritable(e);
        }
    }

    /** Free space of the data directory, or -1 when it cannot be told. */
    public long freeBytes() {
        try {
            return Files.getFileStore(Files.isDirectory(dir) ? dir : dataDir).getUsableSpace();
        } catch (IOException | UncheckedIOException e) {
            return -1;
        }
    }

    /** True while the data directory has at least {@link Limits#minFreeBytes()} free (or its free space is unknown). */
    public boolean hasMinimumFreeSpace() {
        long free = freeBytes();
        return free < 0 || free >= limits.minFreeBytes();
    }

    private void checkFreeSpace(long comingBytes) {
        long free = freeBytes();
        if (free < 0) {
            return;
        }
        if (free - comingBytes < limits.minFreeBytes()) {
            String left = comingBytes > 0 && free >= limits.minFreeBytes()
                    ? " and would have " + Limits.describe(Math.max(0, free - comingBytes)) + " after this upload of "
                    + Limits.describe(comingBytes) : "";
            throw new StorageFullException("The data directory has " + Limits.describe(free) + " free" + left
                    + ", below the " + Limits.describe(limits.minFreeBytes()) + " it must keep (WINNOW_MIN_FREE_BYTES); "
                    + "uploads are refused until the operator frees space. Nothing was stored; send the upload again later.");
        }
    }

    private StorageFullException unwritable(IOException e) {
        return new StorageFullException("The upload could not be written to the data directory ("
                + (StorageFaults.isDiskFull(e) ? "the disk is full" : "it cannot be written") + "); nothing was stored. "
                + "Send the upload again once the operator has fixed the storage.");
    }

    /**
     * The copy loop: reads the body, writes it to the file, counts raw and (for gzip) decoded bytes. The file is written
     * in whole blocks of {@link DirectFile}'s buffer, however few bytes one socket read brought.
     */
    private final class Copy {
        private final InputStream body;
        private final OutputStream out;
        private final byte[] buffer = new byte[BUFFER];
        private long written;
        private long nextSpaceCheck = SPACE_CHECK_EVERY;

        Copy(InputStream body, OutputStream out) {
            this.body = body;
            this.out = out;
        }

        /** Reads the body through a gzip decoder that only counts; a body that is not valid gzip is left to the job. */
        void countDecoded() throws IOException {
            InputStream tee = new FilterInputStream(body) {
                @Override
                public int read() throws IOException {
                    byte[] one = new byte[1];
                    int n = read(one, 0, 1);
                    return n < 0 ? -1 : one[0] & 0xff;
                }

                @Override
                public int read(byte[] b, int off, int len) throws IOException {
                    int n = in.read(b, off, len);
                    if (n > 0) {
                        store(b, off, n);
                    }
                    return n;
                }
            };
            long decoded = 0;
            try (GZIPInputStream gz = new GZIPInputStream(new NonClosing(tee), BUFFER)) {
                byte[] out = new byte[BUFFER];
                for (int n; (n = gz.read(out)) >= 0; ) {
                    decoded += n;
                    if (decoded > limits.maxUploadBytes()) {
                        throw new UploadTooLargeException(limits.maxUploadBytes(), true);
                    }
                }
            } catch (java.util.zip.ZipException | java.io.EOFException notGzip) {
                // the job reports the broken gzip data with its line; spool the rest as it is
            }
        }

        void drain() throws IOException {
            for (int n; (n = body.read(buffer)) >= 0; ) {
                store(buffer, 0, n);
            }
        }

        private void store(byte[] b, int off, int n) {
            written += n;
            if (written > limits.maxUploadBytes()) {
                throw new UploadTooLargeException(limits.maxUploadBytes(), false);
            }
            if (written >= nextSpaceCheck) {
                nextSpaceCheck += SPACE_CHECK_EVERY;
                checkFreeSpace(0);
            }
            try {
                out.write(b, off, n);
            } catch (IOException e) {
                throw unwritable(e);
            }
        }
    }

    /** Keeps the gzip decoder from closing the request body. */
    private static final class NonClosing extends FilterInputStream {
        NonClosing(InputStream in) {
            super(in);
        }

        @Override
        public int read(byte[] b, int off, int len) throws IOException {
            return in.read(b, off, len);
        }

        @Override
        public void close() {
        }
    }

    /**
     * The body a job refers to as a local file: a spooled file as it is; a body in the store copied once to a local
     * file of this instance, which {@link #delete} removes with the body (and start-up, after a crash).
     */
    public Path resolve(String reference) throws IOException {
        if (!reference.startsWith(STORED)) {
            return dataDir.resolve(reference);
        }
        if (store == null) {
            throw new IOException("the upload body " + reference + " is in a database spool this instance does not use");
        }
        Path copy = localCopy(reference);
        if (Files.exists(copy)) {
            return copy;
        }
        Files.createDirectories(copy.getParent());
        Path partial = copy.resolveSibling(copy.getFileName() + ".partial");
        try (DirectFile.Output out = DirectFile.create(partial)) {
            if (!store.copyTo(reference.substring(STORED.length()), out)) {
                throw new IOException("the spooled upload body is missing from the store");
            }
            out.finish();
        } catch (IOException | RuntimeException e) {
            Files.deleteIfExists(partial);
            throw e;
        }
        Files.move(partial, copy, java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        return copy;
    }

    private Path localCopy(String reference) {
        return dataDir.resolve("spool-work").resolve(reference.substring(STORED.length()) + ".upload");
    }

    public void delete(String reference) {
        if (reference == null) {
            return;
        }
        try {
            if (reference.startsWith(STORED)) {
                Files.deleteIfExists(localCopy(reference));
                if (store != null) {
                    store.delete(reference.substring(STORED.length()));
                }
                return;
            }
            Files.deleteIfExists(dataDir.resolve(reference));
        } catch (IOException e) {
            // a leftover spool file wastes disk but is harmless
        }
    }

    /**
     * Deletes spooled bodies whose reference is not in {@code referenced}; returns how many. Files always (the disk
     * spool is this instance's own; give every instance its own WINNOW_DATA_DIR), bodies in the store only when older
     * than an hour, since another instance may have stored one a moment ago and not yet queued its job. Local copies
     * left by a crash go too.
     */
    public int removeUnreferenced(java.util.Set<String> referenced) throws IOException {
        int removed = 0;
        if (Files.isDirectory(dir)) {
            try (var files = Files.list(dir)) {
                for (Path file : (Iterable<Path>) files::iterator) {
                    if (!referenced.contains(dataDir.relativize(file).toString())) {
                        Files.deleteIfExists(file);
                        removed++;
                    }
                }
            }
        }
        Path work = dataDir.resolve("spool-work");
        if (Files.isDirectory(work)) {
            try (var files = Files.list(work)) {
                for (Path file : (Iterable<Path>) files::iterator) {
                    Files.deleteIfExists(file);
                }
            }
        }
        if (store != null) {
            for (String id : store.storedBefore(OffsetDateTime.now(ZoneOffset.UTC).minus(STORED_ORPHAN_AGE))) {
                if (!referenced.contains(STORED + id)) {
                    store.delete(id);
                    removed++;
                }
            }
        }
        return removed;
    }

    public record Spooled(String relativePath, long size) {
    }
}
