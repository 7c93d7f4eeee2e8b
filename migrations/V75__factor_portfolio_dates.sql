-- Stored portfolio returns, one row per (version, date) holding every portfolio's return on that date, packed by
-- FactorStore (a format byte, the count, then each portfolio's name and return; a portfolio without a return on
-- that date is left out). A build of a quintile sort over 6,300 dates writes 6,300 rows here instead of 31,500 in
-- factor_portfolio_returns, and the store's cost of a build (inserts, index entries, the commit) goes with the rows.
-- factor_portfolio_returns stays: versions built before this migration keep their rows there, readers take the union
-- of both tables, and every build, extension or revision deletes the dates it replaces from both.
CREATE TABLE factor_portfolio_dates (
    factor_id  BIGINT NOT NULL,
    version    INTEGER NOT NULL,
    obs_date   DATE NOT NULL,
    packed     BYTEA NOT NULL,
    PRIMARY KEY (factor_id, version, obs_date),
    FOREIGN KEY (factor_id, version) REFERENCES factor_versions (factor_id, version)
);
