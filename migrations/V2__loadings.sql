-- Security loadings for the risk system. Portable SQL: runs on H2 2.x and PostgreSQL 13+ unchanged.

-- The default factor set of a panel: the loadings kept up to date after every upload.
-- factors is the comma-separated list of factor names in regression order.
CREATE TABLE loadings_config (
    panel_id     BIGINT PRIMARY KEY REFERENCES panels (id),
    factors      VARCHAR(100000) NOT NULL,
    window_size  INTEGER NOT NULL,
    min_obs      INTEGER NOT NULL,
    updated_at   TIMESTAMP WITH TIME ZONE NOT NULL
);

-- One row per (panel, as-of date): every security's loadings, encoded as one blob
-- (see dev.winnow.store.LoadingsCodec). fingerprint names the factors with their versions and data
-- versions, the window and min_obs; a row whose fingerprint differs from the current one is stale
-- and never served. factor_digest identifies the factor returns the window used, so a row whose factor
-- data did not change can be re-stamped instead of recomputed.
CREATE TABLE stored_loadings (
    panel_id        BIGINT NOT NULL REFERENCES panels (id),
    as_of           DATE NOT NULL,
    fingerprint     VARCHAR(100000) NOT NULL,
    factor_digest   BIGINT NOT NULL,
    security_count  INTEGER NOT NULL,
    payload         BYTEA NOT NULL,
    computed_at     TIMESTAMP WITH TIME ZONE NOT NULL,
    PRIMARY KEY (panel_id, as_of)
);
