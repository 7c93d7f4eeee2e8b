package dev.winnow.ingest;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;

import java.util.Arrays;
import java.util.Locale;

/**
 * How an upload relates to the rows a panel or series already holds.
 * {@link #APPEND}: every date must come after the last stored date. {@link #REVISE}: any dates; the uploaded dates
 * replace the stored rows of those dates. The wire name (lower case) is the {@code ?mode=} value and what upload
 * jobs keep in the store.
 */
public enum UploadMode {
    APPEND,
    REVISE;

    @JsonValue
    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }

    @JsonCreator
    public static UploadMode fromWire(String wire) {
        return Arrays.stream(values()).filter(m -> m.wireName().equals(wire)).findFirst()
                .orElseThrow(() -> new IllegalArgumentException("upload mode '" + wire + "' is not append or revise"));
    }
}
