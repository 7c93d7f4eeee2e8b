package dev.winnow.store;

import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;
import org.jdbi.v3.core.statement.PreparedBatch;

import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Collection;
import java.util.List;
import java.util.Optional;
import java.util.StringJoiner;

/**
 * Loadings configurations and stored loadings: one row per (panel, as-of date) holding every security's loadings
 * ({@link LoadingsCodec}) and the fingerprint of what they were computed from ({@link #fingerprint}).
 * A row is served only while its fingerprint equals the current one.
 */
public final class LoadingsStore {
    private static final String CONFIG_COLUMNS = "factors, window_size, min_obs, updated_at";
    private static final RowMapper<LoadingsSpec> SPEC = (rs, ctx) ->
            new LoadingsSpec(List.of(rs.getString(1).split(",")), rs.getInt(2), rs.getInt(3));

    private final Jdbi jdbi;

    public LoadingsStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    /** A panel's default factor set. */
    public record LoadingsConfig(long panelId, LoadingsSpec spec, OffsetDateTime updatedAt) {
    }

    /** What a stored row was computed from, without its payload. */
    public record Stamp(LocalDate asOf, String fingerprint, long factorDigest) {
    }

    /**
     * Identifies the inputs of stored loadings besides the panel: the window, min_obs and, in regression order, each
     * factor's name, version and data version (which moves whenever the factor's series is rebuilt).
     */
    public static String fingerprint(LoadingsSpec spec, List<FactorVersionRecord> factors) {
        if (factors.size() != spec.factorCount()) {
            throw new IllegalArgumentException("need one factor version per factor of the spec");
        }
        StringJoiner names = new StringJoiner(",");
        for (int j = 0; j < factors.size(); j++) {
            FactorVersionRecord f = factors.get(j);
            if (!f.name().equals(spec.factors().get(j))) {
                throw new IllegalArgumentException("factor versions must follow the spec's order; found " + f.name()
                        + " where " + spec.factors().get(j) + " belongs");
            }
            names.add(f.name() + ":" + f.version() + ":" + f.dataVersion());
        }
        return "window=" + spec.window() + ";min_obs=" + spec.minObs() + ";factors=" + names;
    }

    public Optional<LoadingsConfig> config(long panelId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + CONFIG_COLUMNS + " FROM loadings_config WHERE panel_id = :p")
                .bind("p", panelId)
                .map((rs, ctx) -> new LoadingsConfig(panelId, SPEC.map(rs, ctx), rs.getObject(4, OffsetDateTime.class)))
                .findOne());
    }

    /**
     * Sets a panel's configuration. When the factors, window or min_obs change, the panel's stored loadings are
     * deleted in the same transaction: they belong to the old configuration.
     */
    public LoadingsConfig saveConfig(long panelId, LoadingsSpec spec) {
        OffsetDateTime now = OffsetDateTime.now(ZoneOffset.UTC);
        jdbi.useTransaction(h -> {
            Optional<LoadingsSpec> old = h.createQuery("SELECT " + CONFIG_COLUMNS + " FROM loadings_config WHERE panel_id = :p")
                    .bind("p", panelId).map(SPEC).findOne();
            if (old.isPresent() && old.get().equals(spec)) {
                return;
            }
            h.createUpdate("DELETE FROM stored_loadings WHERE panel_id = :p").bind("p", panelId).execute();
            h.createUpdate("DELETE FROM loadings_config WHERE panel_id = :p").bind("p", panelId).execute();
            h.createUpdate("INSERT INTO loadings_config (panel_id, factors, window_size, min_obs, updated_at) VALUES (:p, :f, :w, :m, :now)")
                    .bind("p", panelId).bind("f", String.join(",", spec.factors())).bind("w", spec.window())
                    .bind("m", spec.minObs()).bind("now", now).execute();
        });
        return config(panelId).orElseThrow();
    }

    /** Stores (or replaces) the loadings of each table's date, all in one transaction. */
    public void save(long panelId, List<LoadingsTable> tables, String fingerprint) {
        if (tables.isEmpty()) {
            return;
        }
        OffsetDateTime now = OffsetDateTime.now(ZoneOffset.UTC);
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
            deleteDates(h, panelId, tables.stream().map(LoadingsTable::date).toList());
            PreparedBatch insert = h.prepareBatch("INSERT INTO stored_loadings (panel_id, as_of, fingerprint, factor_digest, "
                    + "security_count, payload, computed_at) VALUES (:p, :d, :f, :g, :n, :b, :now)");
            for (LoadingsTable t : tables) {
                insert.bind("p", panelId).bind("d", t.date()).bind("f", fingerprint).bind("g", t.factorDigest())
                        .bind("n", t.size()).bind("b", LoadingsCodec.encode(t)).bind("now", now).add();
            }
            insert.execute();
        });
    }

    /** The stored loadings at a date when they exist and were computed from {@code fingerprint}; else empty. */
    public Optional<LoadingsTable> read(long panelId, LocalDate asOf, String fingerprint) {
        return jdbi.withHandle(h -> h.createQuery("SELECT factor_digest, payload FROM stored_loadings "
                        + "WHERE panel_id = :p AND as_of = :d AND fingerprint = :f")
                .bind("p", panelId).bind("d", asOf).bind("f", fingerprint)
                .map((rs, ctx) -> LoadingsCodec.decode(asOf, rs.getLong(1), rs.getBytes(2)))
                .findOne());
    }

    /** Every stored row's stamp, by date. */
    public List<Stamp> stamps(long panelId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT as_of, fingerprint, factor_digest FROM stored_loadings WHERE panel_id = :p ORDER BY as_of")
                .bind("p", panelId)
                .map((rs, ctx) -> new Stamp(rs.getObject(1, LocalDate.class), rs.getString(2), rs.getLong(3)))
                .list());
    }

    /** Marks rows as computed from {@code fingerprint} without touching their loadings. */
    public void restamp(long panelId, Collection<LocalDate> dates, String fingerprint) {
        if (dates.isEmpty()) {
            return;
        }
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
            PreparedBatch batch = h.prepareBatch("UPDATE stored_loadings SET fingerprint = :f WHERE panel_id = :p AND as_of = :d");
            for (LocalDate d : dates) {
                batch.bind("f", fingerprint).bind("p", panelId).bind("d", d).add();
            }
            batch.execute();
        });
    }

    /** Deletes the stored rows of the given dates. */
    public void delete(long panelId, Collection<LocalDate> dates) {
        if (dates.isEmpty()) {
            return;
        }
        jdbi.useTransaction(h -> deleteDates(h, panelId, dates));
    }

    private static void deleteDates(Handle h, long panelId, Collection<LocalDate> dates) {
        PreparedBatch batch = h.prepareBatch("DELETE FROM stored_loadings WHERE panel_id = :p AND as_of = :d");
        for (LocalDate d : dates) {
            batch.bind("p", panelId).bind("d", d).add();
        }
        batch.execute();
    }
}
