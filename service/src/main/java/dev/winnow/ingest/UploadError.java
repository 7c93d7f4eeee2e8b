package dev.winnow.ingest;

import java.util.Objects;

/**
 * One problem found in an upload.
 *
 * @param line    1-based physical line where the offending record starts (the header is line 1)
 * @param column  name of the offending column, or null when the problem concerns the whole row or file
 * @param message what is wrong and how to fix it
 */
public record UploadError(long line, String column, String message) {

    public UploadError {
        if (line < 1) {
            throw new IllegalArgumentException("line must be at least 1, got " + line);
        }
        Objects.requireNonNull(message, "message");
    }
}
