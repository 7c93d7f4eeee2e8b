package dev.winnow.store;

import java.util.Arrays;
import java.util.Locale;

/** Where a job is: queued, running, or ended (succeeded or failed). The wire name is the lower-case name. */
public enum JobState {
    QUEUED,
    RUNNING,
    SUCCEEDED,
    FAILED;

    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }

    public boolean finished() {
        return this == SUCCEEDED || this == FAILED;
    }

    public static JobState fromWire(String wire) {
        return Arrays.stream(values()).filter(s -> s.wireName().equals(wire)).findFirst()
                .orElseThrow(() -> new IllegalStateException("unknown job state '" + wire + "' in the store"));
    }
}
