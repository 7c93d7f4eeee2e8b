package dev.winnow.store;

/** Where a factor version's series is: being built, ready to serve, or failed to build. Wire name: lower case. */
public enum VersionStatus {
    BUILDING,
    READY,
    FAILED;

    public String wireName() {
        return WireNames.of(this);
    }

    @Override
    public String toString() {
        return wireName();
    }

    public static VersionStatus fromWire(String wire) {
        return WireNames.parse(VersionStatus.class, wire, "factor version status in the store");
    }
}
