package dev.winnow.store;

import org.slf4j.Logger;

/**
 * Logs storage faults without flooding the log while the storage is down: the first fault of a spell (and one a
 * minute after that) with its stack trace, the others as one line.
 */
public final class StorageFaultLog {
    private static final long FULL_EVERY_NANOS = 60_000_000_000L;
    private static volatile long lastFull = System.nanoTime() - FULL_EVERY_NANOS;

    private StorageFaultLog() {
    }

    public static void note(Logger log, String where, Throwable fault) {
        long now = System.nanoTime();
        if (now - lastFull >= FULL_EVERY_NANOS) {
            lastFull = now;
            log.error("storage fault on {}", where, fault);
        } else {
            log.warn("storage fault on {}: {}", where, StorageFaults.isDiskFull(fault) ? "disk full" : fault.getClass().getSimpleName());
        }
    }
}
