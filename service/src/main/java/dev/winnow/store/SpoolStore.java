package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/**
 * Upload bodies kept in the store as chunks of {@link #CHUNK_BYTES}, so every instance sharing the store can read
 * them. A body and its row in {@code spool_files} commit together; readers fetch one chunk at a time.
 */
public final class SpoolStore {
    public static final int CHUNK_BYTES = 1 << 20;

    private final Jdbi jdbi;

    public SpoolStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    /** Stores the whole stream under {@code id} in one transaction; returns its size in bytes. */
    public long write(String id, InputStream body) throws IOException {
        return jdbi.inTransaction(h -> {
                // the row first, so the chunks' foreign key holds; its size is set once the body is read
                h.createUpdate("INSERT INTO spool_files (id, size, created_at) VALUES (:id, 0, :now)")
                        .bind("id", id).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).execute();
                byte[] buffer = new byte[CHUNK_BYTES];
                long size = 0;
                int chunk = 0;
                while (true) {
                    int filled = body.readNBytes(buffer, 0, buffer.length);
                    if (filled == 0) {
                        break;
                    }
                    byte[] data = filled == buffer.length ? buffer : java.util.Arrays.copyOf(buffer, filled);
                    h.createUpdate("INSERT INTO spool_chunks (file_id, chunk, data) VALUES (:id, :n, :d)")
                            .bind("id", id).bind("n", chunk++).bind("d", data).execute();
                    size += filled;
                    if (filled < buffer.length) {
                        break;
                    }
                }
                h.createUpdate("UPDATE spool_files SET size = :s WHERE id = :id").bind("s", size).bind("id", id).execute();
                return size;
            });
    }

    /** Copies a stored body to {@code out}, chunk by chunk; false when there is no such body. */
    public boolean copyTo(String id, OutputStream out) throws IOException {
        if (!exists(id)) {
            return false;
        }
        for (int chunk = 0; ; chunk++) {
            int n = chunk;
            byte[] data = jdbi.withHandle(h -> h.createQuery("SELECT data FROM spool_chunks WHERE file_id = :id AND chunk = :n")
                    .bind("id", id).bind("n", n).map((rs, ctx) -> rs.getBytes(1)).findOne().orElse(null));
            if (data == null) {
                return true;
            }
            out.write(data);
        }
    }

    public boolean exists(String id) {
        return jdbi.withHandle(h -> h.createQuery("SELECT COUNT(*) FROM spool_files WHERE id = :id").bind("id", id)
                .mapTo(Integer.class).one()) > 0;
    }

    public void delete(String id) {
        jdbi.useTransaction(h -> {
            h.createUpdate("DELETE FROM spool_chunks WHERE file_id = :id").bind("id", id).execute();
            h.createUpdate("DELETE FROM spool_files WHERE id = :id").bind("id", id).execute();
        });
    }

    /** Ids of bodies stored before {@code before}. */
    public List<String> storedBefore(OffsetDateTime before) {
        return jdbi.withHandle(h -> h.createQuery("SELECT id FROM spool_files WHERE created_at < :t").bind("t", before)
                .mapTo(String.class).list());
    }
}
