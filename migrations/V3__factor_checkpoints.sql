-- Engine checkpoints of built factors. Portable SQL: runs on H2 2.x and PostgreSQL 13+ unchanged.

-- The engine state of a factor version after its first processed_dates grid dates (last_date being the last of
-- them), with the cumulative counts its build report needs up to there. A revision resumes from the latest
-- checkpoint before its earliest changed date instead of rebuilding the whole history; a rebuild, extension or
-- revision replaces the checkpoints it recomputes in the same transaction as the series.
CREATE TABLE factor_checkpoints (
    factor_id               BIGINT NOT NULL,
    version                 INTEGER NOT NULL,
    processed_dates         INTEGER NOT NULL,
    last_date               DATE NOT NULL,
    observations            INTEGER NOT NULL,
    periods_without_return  INTEGER NOT NULL,
    state                   BYTEA NOT NULL,
    PRIMARY KEY (factor_id, version, processed_dates),
    FOREIGN KEY (factor_id, version) REFERENCES factor_versions (factor_id, version)
);
