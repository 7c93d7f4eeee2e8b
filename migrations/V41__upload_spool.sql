-- Upload bodies spooled in the store, so that any worker instance can read an upload any API instance received
-- (issue 13; used on PostgreSQL, while the embedded store keeps its spool on local disk). Portable SQL: runs on
-- H2 2.x and PostgreSQL 13+ unchanged.
-- A body is written as chunks in one transaction with its spool_files row; the commit comes before the 202.
CREATE TABLE spool_files (
    id          VARCHAR(40) PRIMARY KEY,
    size        BIGINT NOT NULL,
    created_at  TIMESTAMP WITH TIME ZONE NOT NULL
);

CREATE TABLE spool_chunks (
    file_id  VARCHAR(40) NOT NULL REFERENCES spool_files (id),
    chunk    INTEGER NOT NULL,
    data     BYTEA NOT NULL,
    PRIMARY KEY (file_id, chunk)
);
