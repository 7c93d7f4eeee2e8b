-- Bucket portfolios of sort factors and the six portfolios of size_sort factors. Portable SQL: runs on H2 2.x and
-- PostgreSQL 13+ unchanged.

-- One row per (version, portfolio, date) on which that portfolio has a return; maintained by builds, extensions and
-- revisions exactly like factor_returns (same transaction, same replaced dates).
CREATE TABLE factor_portfolio_returns (
    factor_id  BIGINT NOT NULL,
    version    INTEGER NOT NULL,
    portfolio  VARCHAR(20) NOT NULL,
    obs_date   DATE NOT NULL,
    ret        DOUBLE PRECISION NOT NULL,
    PRIMARY KEY (factor_id, version, portfolio, obs_date),
    FOREIGN KEY (factor_id, version) REFERENCES factor_versions (factor_id, version)
);

-- Sort and size_sort engines now hold every bucket (and all six 2x3 portfolios), so engine states and checkpoints
-- stored before this version cannot be resumed: drop them and mark those versions 'building'. At start-up Winnow
-- queues a build for every version left 'building' without a job, which rebuilds each once, portfolios included.
DELETE FROM factor_checkpoints WHERE EXISTS (
    SELECT 1 FROM factor_versions v
    WHERE v.factor_id = factor_checkpoints.factor_id AND v.version = factor_checkpoints.version
      AND v.method IN ('sort', 'size_sort'));
UPDATE factor_versions SET engine_state = NULL, status = 'building'
    WHERE method IN ('sort', 'size_sort') AND status = 'ready';
