-- Several worker processes on one store (issue 13). Portable SQL: runs on H2 2.x and PostgreSQL 13+ unchanged.

-- A claimed job carries a lease: the worker that runs it (lease_owner) renews lease_until while it runs; a job
-- still 'running' after its lease expired belongs to a worker that died and is claimed again by another.
-- attempts counts the claims; finished_by names the worker that recorded the end.
ALTER TABLE jobs ADD COLUMN lease_owner VARCHAR(100);
ALTER TABLE jobs ADD COLUMN lease_until TIMESTAMP WITH TIME ZONE;
ALTER TABLE jobs ADD COLUMN attempts INTEGER DEFAULT 0 NOT NULL;
ALTER TABLE jobs ADD COLUMN finished_by VARCHAR(100);

-- What a job reads or writes: 'panel:<name>', 'factor:<name>', or '*' (everything). A queued job starts only when
-- no earlier unfinished job holds one of its resources in a conflicting mode (either of the two writes it).
CREATE TABLE job_resources (
    job_id    BIGINT NOT NULL REFERENCES jobs (id),
    resource  VARCHAR(210) NOT NULL,
    mode      VARCHAR(5) NOT NULL,
    PRIMARY KEY (job_id, resource)
);
CREATE INDEX job_resources_resource ON job_resources (resource, job_id);

-- Jobs queued or left running before this version touch everything: they keep their order against all others.
INSERT INTO job_resources (job_id, resource, mode) SELECT id, '*', 'write' FROM jobs WHERE state IN ('queued', 'running');

-- One row, locked by every enqueue: job ids are handed out and committed in the same order, so queue order (id
-- order) is the order in which jobs became visible, whichever instance queued them.
CREATE TABLE job_queue_order (
    id    INTEGER PRIMARY KEY,
    last  BIGINT NOT NULL
);
INSERT INTO job_queue_order (id, last) VALUES (1, 0);
