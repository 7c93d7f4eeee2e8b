package dev.winnow.ingest;

import dev.winnow.store.SpoolStore;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.UUID;

/**
 * Upload bodies are made durable before the job is queued and 202 is answered, so an acknowledged upload survives a
 * crash. On the embedded store they are files under the data directory, forced to stable storage; on a shared
 * store (PostgreSQL) they are chunks in the database ({@link SpoolStore}), committed before the 202, so a worker
 * on another machine can read them without a shared file system. A job reads a body through {@link #resolve}: a
 * spooled file as it is, a stored body copied to a local temporary file for the parse.
 */
public final class UploadSpool {
    private static final String STORED = "db:";
    /** How old an unreferenced stored body must be before start-up removes it: another instance may be queueing it. */
    private static final Duration STORED_ORPHAN_AGE = Duration.ofHours(1);

    private final Path dataDir;
    private final Path dir;
    private final SpoolStore store;

    /** Bodies as files under {@code dataDir/spool}. */
    public UploadSpool(Path dataDir) {
        this(dataDir, null);
    }

    /** Bodies in the store when {@code store} is not null (local files only for the time a job parses one). */
    public UploadSpool(Path dataDir, SpoolStore store) {
        this.dataDir = dataDir;
        this.dir = dataDir.resolve("spool");
        this.store = store;
    }

    /** Makes the stream durable; returns the reference the job keeps and the body's size. */
    public Spooled write(InputStream body) throws IOException {
        if (store != null) {
            String id = UUID.randomUUID().toString();
            long size = store.write(id, body);
            return new Spooled(STORED + id, size);
        }
        Files.createDirectories(dir);
        Path file = dir.resolve(UUID.randomUUID() + ".upload");
        long size;
        try (FileChannel channel = FileChannel.open(file, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
             OutputStream out = java.nio.channels.Channels.newOutputStream(channel)) {
            size = body.transferTo(out);
            out.flush();
            channel.force(true);
        } catch (IOException e) {
            Files.deleteIfExists(file);
            throw e;
        }
        return new Spooled(dataDir.relativize(file).toString(), size);
    }

    /**
     * The body a job refers to as a local file: a spooled file as it is; a body in the store copied once to a
     * temporary file of this instance, which {@link #delete} removes with the body (and start-up, after a crash).
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
        try (OutputStream out = new java.io.BufferedOutputStream(Files.newOutputStream(partial), 1 << 16)) {
            if (!store.copyTo(reference.substring(STORED.length()), out)) {
                throw new IOException("the spooled upload body is missing from the store");
            }
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
     * spool is this instance's own; give every instance its own WINNOW_DATA_DIR), bodies in the store only when older than an hour, since another instance may
     * have stored one a moment ago and not yet queued its job. Temporary copies left by a crash go too.
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
