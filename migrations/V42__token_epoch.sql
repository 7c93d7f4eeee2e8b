-- A counter bumped in the same transaction as every token insert and delete (issue 13), so that each instance
-- sharing the store sees a revocation in its very next request with one cheap read, and reloads its token list
-- only when the counter moved. Portable SQL: runs on H2 2.x and PostgreSQL 13+ unchanged.
CREATE TABLE token_epoch (
    id     INTEGER PRIMARY KEY,
    epoch  BIGINT NOT NULL
);
INSERT INTO token_epoch (id, epoch) VALUES (1, 0);
