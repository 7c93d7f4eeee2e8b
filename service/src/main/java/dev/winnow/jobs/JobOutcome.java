package dev.winnow.jobs;

import dev.winnow.store.JobStore.Counters;

import java.util.List;
import java.util.Objects;

/**
 * What a finished job reports: success, its row counters, and either its report (success) or its errors, each with
 * the line and column it was found at where it has one (an upload's first errors in file order).
 */
public record JobOutcome(boolean succeeded, Counters counters, List<JobError> errors, JobReport report) {

    /** A reason a job failed; {@code line} and {@code column} null when it is not about one place of an upload. */
    public record JobError(Long line, String column, String message) {
        public JobError {
            Objects.requireNonNull(message, "message");
        }
    }

    public JobOutcome {
        errors = List.copyOf(errors);
    }

    public static JobOutcome success(Counters counters, JobReport report) {
        return new JobOutcome(true, counters, List.of(), Objects.requireNonNull(report, "report"));
    }

    public static JobOutcome failure(Counters counters, List<JobError> errors) {
        return new JobOutcome(false, counters, errors, null);
    }

    /** A failure with one error that is not about a place in an upload. */
    public static JobOutcome failure(Counters counters, String message) {
        return failure(counters, List.of(new JobError(null, null, message)));
    }
}
