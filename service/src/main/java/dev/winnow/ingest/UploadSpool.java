package dev.winnow.ingest;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.UUID;

/**
 * Upload bodies are written to disk and forced to stable storage before the job is queued and 202 is answered,
 * so an acknowledged upload survives a crash.
 */
public final class UploadSpool {
    private final Path dataDir;
    private final Path dir;

    public UploadSpool(Path dataDir) {
        this.dataDir = dataDir;
        this.dir = dataDir.resolve("spool");
    }

    /** Copies the stream to a new spool file; returns its path relative to the data dir and its size. */
    public Spooled write(InputStream body) throws IOException {
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

    public Path resolve(String relative) {
        return dataDir.resolve(relative);
    }

    public void delete(String relative) {
        try {
            Files.deleteIfExists(resolve(relative));
        } catch (IOException e) {
            // a leftover spool file wastes disk but is harmless
        }
    }

    /** Deletes spool files whose relative path is not in {@code referenced}; returns how many. */
    public int removeUnreferenced(java.util.Set<String> referenced) throws IOException {
        if (!Files.isDirectory(dir)) {
            return 0;
        }
        int removed = 0;
        try (var files = Files.list(dir)) {
            for (Path file : (Iterable<Path>) files::iterator) {
                if (!referenced.contains(dataDir.relativize(file).toString())) {
                    Files.deleteIfExists(file);
                    removed++;
                }
            }
        }
        return removed;
    }

    public record Spooled(String relativePath, long size) {
    }
}
