package dev.winnow.store;

/**
 * How the read caches learn that stored data changed. Every store commits first and then calls
 * {@link #committed(Topic)}; a cache remembers the {@link #version(Topic)} it was filled at and refills when the
 * version differs. Read paths call {@link #version(Topic)} on every request, so it must be cheap (no I/O).
 *
 * <p>Contract, for every implementation: after {@code committed(t)} returns on any instance that shares the store,
 * {@code version(t)} on every instance answers a value it never answered before the commit. With one process this
 * is a counter ({@link LocalChangeFeed}). With several instances on one PostgreSQL store,
 * {@link PostgresChangeFeed#committed} returns only once every live instance has acknowledged the change, so
 * "after" means at once; an instance that could not be waited for checks the store before answering. See
 * DEVELOPERS.md, "The change feed".
 */
public interface ChangeFeed {

    /** What changed: each topic invalidates its own caches. */
    enum Topic {
        /** Factor definitions, versions, status, retirement and series (any data_version bump). */
        FACTORS,
        /** API tokens: creation and revocation. */
        TOKENS
    }

    /** A number that changes whenever a commit on {@code topic} is known here; compared for equality only. */
    long version(Topic topic);

    /** Called by a store after a transaction that changed {@code topic} has committed. */
    void committed(Topic topic);
}
