package dev.winnow.store;

/** Where a job is: queued, running, or ended (succeeded or failed). The wire name is the lower-case name. */
public enum JobState {
    QUEUED,
    RUNNING,
    SUCCEEDED,
    FAILED;

    public String wireName() {
        return WireNames.of(this);
    }

    /** The wire name, so that logs and messages spell the state as the API does. */
    @Override
    public String toString() {
        return wireName();
    }

    public boolean finished() {
        return this == SUCCEEDED || this == FAILED;
    }

    public static JobState fromWire(String wire) {
        return WireNames.parse(JobState.class, wire, "job state in the store");
    }
}
