package dev.winnow.api;

import dev.winnow.store.JobStore.QueueCounts;

/**
 * The answer of {@code GET /health}.
 *
 * @param status {@code ok}; {@code degraded} while the data directory is short of free space (uploads answer 507);
 *               {@code unavailable} (HTTP 503) when the store cannot be used or the worker is not running jobs
 * @param store  {@code ok}, {@code low_space} or {@code unavailable}
 * @param worker {@code idle}, {@code running}, {@code waiting_for_store}, {@code stopped} or {@code dead}
 * @param queue  jobs queued and running, or null when the store cannot be read
 */
public record Health(String status, String store, String worker, QueueCounts queue) {

    /** Where the service gets its health from (wired in app). */
    @FunctionalInterface
    public interface Check {
        Health now();
    }

    public boolean serving() {
        return !status.equals("unavailable");
    }
}
