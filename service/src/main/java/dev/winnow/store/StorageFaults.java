package dev.winnow.store;

import java.io.IOException;
import java.sql.SQLException;
import java.util.Locale;

/**
 * Tells storage faults (a full disk, a file that cannot be written, a store that closed itself) from other
 * failures, by walking an exception's causes. H2 closes its database when a write fails; PostgreSQL reports a full
 * disk as SQLState 53100 and resource problems as class 53 and 58.
 */
public final class StorageFaults {
    /** H2 error codes of a database that cannot go on: closed, I/O failure, file corrupted, read only, shut down. */
    private static final java.util.Set<Integer> H2_STORAGE_CODES = java.util.Set.of(90098, 90028, 90031, 90030, 90097, 90121, 90020, 90013);

    private StorageFaults() {
    }

    /** True when the failure, or a cause of it, is a full disk. */
    public static boolean isDiskFull(Throwable failure) {
        for (Throwable t = failure; t != null; t = t.getCause() == t ? null : t.getCause()) {
            String message = t.getMessage();
            if (message != null) {
                String m = message.toLowerCase(Locale.ROOT);
                if (m.contains("no space left on device") || m.contains("disk full") || m.contains("not enough space")
                        || m.contains("disk quota exceeded")) {
                    return true;
                }
            }
            if (t instanceof SQLException sql && "53100".equals(sql.getSQLState())) {
                return true;
            }
        }
        return false;
    }

    /** JSON or gzip parse errors and a client that went away are IOExceptions too, but not storage faults. */
    private static boolean isParsingOrClient(Throwable t) {
        String name = t.getClass().getName();
        return name.startsWith("com.fasterxml.jackson.") || name.startsWith("org.eclipse.jetty.")
                || t instanceof java.util.zip.ZipException || t instanceof java.io.EOFException
                || t instanceof java.nio.charset.CharacterCodingException;
    }

    /** True when the failure comes from the storage rather than from the job's data or the code. */
    public static boolean isStorageFault(Throwable failure) {
        if (isDiskFull(failure)) {
            return true;
        }
        for (Throwable t = failure; t != null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof IOException && !isParsingOrClient(t)) {
                return true;
            }
            if (t instanceof SQLException sql) {
                String state = sql.getSQLState();
                if (H2_STORAGE_CODES.contains(sql.getErrorCode()) || (state != null
                        && (state.startsWith("08") || state.startsWith("53") || state.startsWith("58")))) {
                    return true;
                }
            }
            if (t.getClass().getName().startsWith("org.h2.mvstore.")) {
                return true;
            }
        }
        return false;
    }
}
