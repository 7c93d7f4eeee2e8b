package dev.winnow.research;

/**
 * The background work the use cases start; the job queue implements it, so that this package needs nothing of
 * the jobs package.
 */
public interface WorkQueue {
    /** Queues the build of one factor version; returns the job id. */
    long queueFactorBuild(String factor, int version);

    /** Queues the build of a family's new variant versions, in one pass over each panel; returns the job id. */
    long queueFamilyBuild(String family, java.util.List<java.util.Map<String, Object>> versions);

    /** Queues the job that stores the loadings of every date of a panel under its config; returns the job id. */
    long queueLoadingsHistory(String panel, long panelId);
}
