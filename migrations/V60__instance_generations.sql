-- Instances that share one store acknowledge every change they have applied (issue 13: "a revoked token is refused
-- by every instance at once"). Portable SQL: runs on H2 2.x and PostgreSQL 13+ unchanged; only the PostgreSQL
-- change feed reads and writes these tables (an H2 store serves one process).

-- One generation per change-feed topic (FACTORS, TOKENS), bumped after every commit on that topic.
CREATE TABLE change_generations (
    topic      VARCHAR(16) PRIMARY KEY,
    generation BIGINT NOT NULL
);
INSERT INTO change_generations (topic, generation) VALUES ('FACTORS', 0);
INSERT INTO change_generations (topic, generation) VALUES ('TOKENS', 0);

-- Every live instance heartbeats here: seen_at is the store's clock at its last check of change_generations, and
-- the *_applied columns the generations whose changes its caches reflect. A writer waits until every instance seen
-- within the lease has applied its generation; an instance not seen within the lease is ignored (and refuses to
-- answer from its caches until it has checked again).
CREATE TABLE instance_generations (
    instance_id     VARCHAR(64) PRIMARY KEY,
    started_at      TIMESTAMP WITH TIME ZONE NOT NULL,
    seen_at         TIMESTAMP WITH TIME ZONE NOT NULL,
    factors_applied BIGINT NOT NULL,
    tokens_applied  BIGINT NOT NULL
);
