package dev.winnow.store;

import java.util.concurrent.atomic.AtomicLongArray;

/** The change feed of a single process: one counter per topic, bumped after each local commit. */
public final class LocalChangeFeed implements ChangeFeed {
    private final AtomicLongArray versions = new AtomicLongArray(Topic.values().length);

    @Override
    public long version(Topic topic) {
        return versions.get(topic.ordinal());
    }

    @Override
    public void committed(Topic topic) {
        versions.incrementAndGet(topic.ordinal());
    }
}
