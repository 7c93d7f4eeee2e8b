package dev.winnow.research;

/**
 * The background work the use cases start; the job queue implements it, so that this package needs nothing of
 * the jobs package.
 */
public interface WorkQueue {
    /** Queues the build of one factor version; returns the job id. */
    long queueFactorBuild(String factor, int version);

    /** Queues the build of a family's new variant versions, in one pass over each panel; returns the job id. */
    long queueFamilyBuild(String family, java.util.List<FactorVersion> versions);

    /** One version of one factor. */
    record FactorVersion(String factor, int version) {
    }

    /** Queues the job that stores the loadings of every date of a panel under its config; returns the job id. */
    long queueLoadingsHistory(String panel, long panelId);
}
