package dev.winnow.store;

import java.util.Arrays;
import java.util.Locale;

/** Where a factor version's series is: being built, ready to serve, or failed to build. Wire name: lower case. */
public enum VersionStatus {
    BUILDING,
    READY,
    FAILED;

    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }

    @Override
    public String toString() {
        return wireName();
    }

    public static VersionStatus fromWire(String wire) {
        return Arrays.stream(values()).filter(s -> s.wireName().equals(wire)).findFirst()
                .orElseThrow(() -> new IllegalStateException("unknown factor version status '" + wire + "' in the store"));
    }
}
