package dev.winnow.jobs;

import com.fasterxml.jackson.annotation.JsonIgnore;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.ingest.UploadMode;
import dev.winnow.store.JobKind;
import dev.winnow.store.JobStore.JobRecord;

import java.io.IOException;
import java.util.List;

/**
 * The parameters of a job, one record per {@link JobKind}, kept in the store as JSON (the field names below are the
 * stored ones, so jobs queued by an earlier build still read).
 */
public sealed interface JobParams {
    /** The kind of job these parameters are for. */
    @JsonIgnore
    JobKind kind();

    /** The parameters of an upload job: where its spooled body is and how to apply it. */
    sealed interface Upload extends JobParams {
        UploadMode mode();

        /** The spooled body, relative to the spool directory. */
        String file();

        boolean gzip();

        default boolean revise() {
            return mode() == UploadMode.REVISE;
        }
    }

    record PanelUpload(String panel, UploadMode mode, String file, boolean gzip) implements Upload {
        @Override
        public JobKind kind() {
            return JobKind.PANEL_UPLOAD;
        }
    }

    record SeriesUpload(String factor, int version, UploadMode mode, String file, boolean gzip) implements Upload {
        @Override
        public JobKind kind() {
            return JobKind.SERIES_UPLOAD;
        }
    }

    record FactorBuild(String factor, int version) implements JobParams {
        @Override
        public JobKind kind() {
            return JobKind.FACTOR_BUILD;
        }
    }

    /** A family's new variant versions, built in one pass over each panel. */
    record FamilyBuild(String family, List<Member> versions) implements JobParams {
        public record Member(String factor, int version) {
        }

        public FamilyBuild {
            versions = List.copyOf(versions);
        }

        @Override
        public JobKind kind() {
            return JobKind.FAMILY_BUILD;
        }
    }

    record LoadingsHistory(String panel, @JsonProperty("panel_id") long panelId) implements JobParams {
        @Override
        public JobKind kind() {
            return JobKind.LOADINGS_HISTORY;
        }
    }

    record CompactStore() implements JobParams {
        @Override
        public JobKind kind() {
            return JobKind.COMPACT_STORE;
        }
    }

    /** The record class of a kind's parameters. */
    static Class<? extends JobParams> type(JobKind kind) {
        return switch (kind) {
            case PANEL_UPLOAD -> PanelUpload.class;
            case SERIES_UPLOAD -> SeriesUpload.class;
            case FACTOR_BUILD -> FactorBuild.class;
            case FAMILY_BUILD -> FamilyBuild.class;
            case LOADINGS_HISTORY -> LoadingsHistory.class;
            case COMPACT_STORE -> CompactStore.class;
        };
    }

    /** The JSON kept in the store. */
    default String json() {
        try {
            return Json.MAPPER.writeValueAsString(this);
        } catch (IOException e) {
            throw new IllegalStateException("could not write job parameters", e);
        }
    }

    /** The parameters of a stored job. */
    static JobParams of(JobRecord job) {
        try {
            return Json.MAPPER.readValue(job.params(), type(job.kind()));
        } catch (IOException e) {
            throw new IllegalStateException("job " + job.id() + " (" + job.kind().wireName() + ") has unreadable parameters: " + job.params(), e);
        }
    }

    /** The parameters of a stored job of the kind {@code type} is for. */
    static <P extends JobParams> P of(JobRecord job, Class<P> type) {
        JobParams params = of(job);
        if (!type.isInstance(params)) {
            throw new IllegalStateException("job " + job.id() + " is a " + job.kind().wireName() + ", not a " + type.getSimpleName());
        }
        return type.cast(params);
    }

    /** The mapper of stored parameters: unknown fields (from a later build) are ignored. */
    final class Json {
        static final ObjectMapper MAPPER = new ObjectMapper().configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false);

        private Json() {
        }
    }
}
