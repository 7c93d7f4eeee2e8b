package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonUnwrapped;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;

import java.time.LocalDate;

/**
 * What a build of a factor version did: counts over the whole stored series (observations, periods without a
 * return) and what this run added (observations, formations). Kept with the version as JSON and shown in job
 * reports; a revision also says where it restarted ({@link Revision}, flattened into the same object).
 *
 * @param revision null except for a report of {@link FactorBuilds#rebuildFrom}
 */
@JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
public record BuildReport(int observations, int periodsWithoutReturn, int newObservations, int newFormations,
                          @JsonUnwrapped Revision revision) {

    /**
     * Where a revision restarted the build.
     *
     * @param rebuiltFrom     the last date of the checkpoint it resumed from; null (written as null) for a full rebuild
     * @param recomputedDates the grid dates computed again
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Revision(LocalDate rebuiltFrom, int recomputedDates) {
    }

    /** This report with where the revision restarted. */
    BuildReport restartedAt(LocalDate rebuiltFrom, int recomputedDates) {
        return new BuildReport(observations, periodsWithoutReturn, newObservations, newFormations,
                new Revision(rebuiltFrom, recomputedDates));
    }
}
