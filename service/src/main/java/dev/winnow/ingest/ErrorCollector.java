package dev.winnow.ingest;

import java.util.ArrayList;
import java.util.List;

/**
 * Keeps the first {@link #MAX_KEPT} errors by line number (ties in arrival order) and counts all of them. Errors
 * usually arrive in line order; the few that do not (decided at the end of a pass) are merged in place.
 */
final class ErrorCollector {

    static final int MAX_KEPT = 100;

    private final List<UploadError> kept = new ArrayList<>();
    private long total;

    void add(long line, String column, String message) {
        total++;
        if (!keeps(line)) {
            return;
        }
        UploadError error = new UploadError(line, column, message);
        int at = kept.size();
        while (at > 0 && kept.get(at - 1).line() > line) {
            at--;
        }
        kept.add(at, error);
        if (kept.size() > MAX_KEPT) {
            kept.remove(MAX_KEPT);
        }
    }

    /** False when an error at this line would be counted but not kept, so its message need not be built. */
    boolean keeps(long line) {
        return kept.size() < MAX_KEPT || line < kept.get(MAX_KEPT - 1).line();
    }

    /** Counts errors that were not worth building (their lines are past the kept ones). */
    void countOnly(long errors) {
        total += errors;
    }

    boolean isEmpty() {
        return total == 0;
    }

    long total() {
        return total;
    }

    List<UploadError> errors() {
        return List.copyOf(kept);
    }
}
