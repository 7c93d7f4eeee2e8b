package dev.winnow.jobs;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonUnwrapped;
import com.fasterxml.jackson.annotation.JsonValue;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.ingest.UploadMode;
import dev.winnow.research.BuildReport;
import dev.winnow.research.LoadingsHistory;
import dev.winnow.research.LoadingsUpdate;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.time.LocalDate;
import java.util.List;
import java.util.Locale;

/**
 * The reports a finished job keeps, one record per job kind, each written to the store as the job's JSON report
 * (snake_case field names) and served as it was written by {@code GET /v1/jobs/{id}}.
 */
public final class JobReports {
    private JobReports() {
    }

    /** What a job that builds factors did with one of them. */
    public enum Action {
        BUILT, REBUILT, EXTENDED, FAILED;

        @JsonValue
        public String wireName() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    /**
     * One factor version a job built, rebuilt or extended, with its build report flattened in; or the error that kept
     * it from being built (then no build report).
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record FactorUpdate(String factor, int version, Action action, @JsonUnwrapped BuildReport build,
                               @JsonInclude(JsonInclude.Include.NON_NULL) String error) {
        static FactorUpdate done(FactorVersionRecord v, Action action, BuildReport build) {
            return new FactorUpdate(v.name(), v.version(), action, build, null);
        }

        static FactorUpdate failed(FactorVersionRecord v, String error) {
            return new FactorUpdate(v.name(), v.version(), Action.FAILED, null, error);
        }
    }

    /** {@code factor_build}: the version built, and the factors that read it, rebuilt after it (dependencies first). */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record FactorBuild(String factor, int version, @JsonUnwrapped BuildReport build, List<FactorUpdate> dependents)
            implements JobReport {
        public FactorBuild {
            dependents = List.copyOf(dependents);
        }
    }

    /** {@code family_build}: each variant of the family built, or why it was not. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record FamilyBuild(String family, List<FactorUpdate> variants) implements JobReport {
        public FamilyBuild {
            variants = List.copyOf(variants);
        }
    }

    /**
     * How long the phases of a panel upload took, in milliseconds; the parse and commit phases are left out when a
     * job queued again after a crash found its upload already committed.
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record UploadTimings(Long parse, Long stagingAfterParse, Long encode, Long stageWrites, Long commit, long factors) {
    }

    /**
     * {@code panel_upload}: the panel, the mode, the dates the upload added or replaced (first and last null when it
     * had none), each live factor on the panel brought up to date, the loadings refresh and the phases' timings.
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record PanelUpload(String panel, UploadMode mode, int dates, LocalDate firstDate, LocalDate lastDate,
                              List<FactorUpdate> factors, LoadingsUpdate loadings,
                              UploadTimings timingsMs)
            implements JobReport {
        public PanelUpload {
            factors = List.copyOf(factors);
        }
    }

    /** {@code series_upload}: the external series, the mode, the rows it held and the factors rebuilt on it. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record SeriesUpload(String factor, int version, UploadMode mode, int dates, List<FactorUpdate> factors)
            implements JobReport {
        public SeriesUpload {
            factors = List.copyOf(factors);
        }
    }

    /** {@code loadings_history}: the loadings history computed. */
    public record LoadingsHistoryComputed(@JsonUnwrapped LoadingsHistory history) implements JobReport {
    }

    /**
     * {@code compact_store}: the store's size before and after (null on PostgreSQL, which reclaims space itself), and
     * what the compaction did.
     */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record StoreCompaction(Long storeBytesBefore, Long storeBytesAfter, String note) implements JobReport {
    }
}
