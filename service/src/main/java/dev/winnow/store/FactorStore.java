package dev.winnow.store;

import dev.winnow.stats.ReturnSeries;
import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;
import org.jdbi.v3.core.statement.PreparedBatch;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.List;
import java.util.Optional;

/** Factors, their immutable versions and each version's series. */
public final class FactorStore {
    private static final String VERSION_COLUMNS = "f.id, f.name, v.version, f.current_version, v.definition, v.method, v.panel_id, "
            + "v.status, v.data_version, v.build_report, v.created_at, v.built_at, f.retired_at";
    private static final RowMapper<FactorVersionRecord> VERSION = (rs, ctx) -> new FactorVersionRecord(
            rs.getLong(1), rs.getString(2), rs.getInt(3), rs.getInt(4), rs.getString(5), rs.getString(6),
            (Long) rs.getObject(7, Long.class), rs.getString(8), rs.getLong(9), rs.getString(10),
            rs.getObject(11, OffsetDateTime.class), rs.getObject(12, OffsetDateTime.class), rs.getObject(13, OffsetDateTime.class));

    private static final int CACHED_SERIES = 64;

    private final Jdbi jdbi;
    /**
     * Recently read series, each with the data version it was read at; a lookup checks the stored data version first,
     * so a rebuild, extension or revision (by any process) is never served stale.
     */
    private final Map<SeriesKey, CachedSeries> recentSeries = Collections.synchronizedMap(
            new LinkedHashMap<>(16, 0.75f, true) {
                @Override
                protected boolean removeEldestEntry(Map.Entry<SeriesKey, CachedSeries> eldest) {
                    return size() > CACHED_SERIES;
                }
            });

    private record SeriesKey(long factorId, int version, Leg leg) {
    }

    private record CachedSeries(long dataVersion, ReturnSeries series) {
    }

    public FactorStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    public record FactorVersionRecord(long factorId, String name, int version, int currentVersion, String definitionJson,
                                      String method, Long panelId, String status, long dataVersion, String buildReport,
                                      OffsetDateTime createdAt, OffsetDateTime builtAt, OffsetDateTime retiredAt) {
        public boolean retired() {
            return retiredAt != null;
        }

        public boolean current() {
            return version == currentVersion;
        }
    }

    /** One stored observation; legs and net are NaN where the method has none. */
    public record StoredReturn(LocalDate date, double spread, double longLeg, double shortLeg, double net) {
    }

    public record StoredTurnover(LocalDate formationDate, double turnover) {
    }

    /** Which stored column a series reads. */
    public enum Leg {
        SPREAD("spread"), LONG("long_leg"), SHORT("short_leg"), NET("net");

        private final String column;

        Leg(String column) {
            this.column = column;
        }
    }

    public record SeriesSummary(LocalDate firstDate, LocalDate lastDate, int observations) {
    }

    /** The current version of a factor (retired or not). */
    public Optional<FactorVersionRecord> current(String name) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                        + "ON v.factor_id = f.id AND v.version = f.current_version WHERE f.name = :name")
                .bind("name", name).map(VERSION).findOne());
    }

    public Optional<FactorVersionRecord> version(String name, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                        + "ON v.factor_id = f.id WHERE f.name = :name AND v.version = :v")
                .bind("name", name).bind("v", version).map(VERSION).findOne());
    }

    /** Current versions of all factors, by name; retired ones only when asked. */
    public List<FactorVersionRecord> listCurrent(boolean includeRetired) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                        + "ON v.factor_id = f.id AND v.version = f.current_version "
                        + (includeRetired ? "" : "WHERE f.retired_at IS NULL ") + "ORDER BY f.name")
                .map(VERSION).list());
    }

    /** Every version of every factor ever built, retired ones included: the trials. */
    public List<FactorVersionRecord> allVersions() {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                        + "ON v.factor_id = f.id ORDER BY f.name, v.version")
                .map(VERSION).list());
    }

    /** Current, live versions built on a panel: the factors an append or revision of that panel must extend. */
    public List<FactorVersionRecord> liveOnPanel(long panelId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                        + "ON v.factor_id = f.id AND v.version = f.current_version "
                        + "WHERE f.retired_at IS NULL AND v.panel_id = :p AND v.status = 'ready' ORDER BY f.name")
                .bind("p", panelId).map(VERSION).list());
    }

    /**
     * Records a definition. When it equals the current version's definition (and the factor is live) nothing changes
     * and that version is returned with {@code created = false}; otherwise a new version counts up from the last.
     * Re-defining a retired factor brings it back.
     */
    public DefineOutcome define(String name, String definitionJson, String method, Long panelId) {
        return jdbi.inTransaction(h -> {
            OffsetDateTime now = OffsetDateTime.now(ZoneOffset.UTC);
            Optional<Long> existing = h.createQuery("SELECT id FROM factors WHERE name = :n").bind("n", name).mapTo(Long.class).findOne();
            long factorId;
            int version;
            if (existing.isEmpty()) {
                factorId = h.createUpdate("INSERT INTO factors (name, current_version, created_at) VALUES (:n, 1, :now)")
                        .bind("n", name).bind("now", now).executeAndReturnGeneratedKeys("id").mapTo(Long.class).one();
                version = 1;
            } else {
                factorId = existing.get();
                FactorVersionRecord current = h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                                + "ON v.factor_id = f.id AND v.version = f.current_version WHERE f.id = :id")
                        .bind("id", factorId).map(VERSION).one();
                if (current.definitionJson().equals(definitionJson) && !current.retired() && !"failed".equals(current.status())) {
                    return new DefineOutcome(current, false);
                }
                version = h.createQuery("SELECT MAX(version) FROM factor_versions WHERE factor_id = :id")
                        .bind("id", factorId).mapTo(Integer.class).one() + 1;
            }
            h.createUpdate("INSERT INTO factor_versions (factor_id, version, definition, method, panel_id, status, data_version, created_at) "
                            + "VALUES (:f, :v, :d, :m, :p, 'building', 0, :now)")
                    .bind("f", factorId).bind("v", version).bind("d", definitionJson).bind("m", method)
                    .bind("p", panelId).bind("now", now).execute();
            h.createUpdate("UPDATE factors SET current_version = :v, retired_at = NULL WHERE id = :f")
                    .bind("v", version).bind("f", factorId).execute();
            FactorVersionRecord created = h.createQuery("SELECT " + VERSION_COLUMNS + " FROM factors f JOIN factor_versions v "
                            + "ON v.factor_id = f.id WHERE f.id = :id AND v.version = :v")
                    .bind("id", factorId).bind("v", version).map(VERSION).one();
            return new DefineOutcome(created, true);
        });
    }

    public record DefineOutcome(FactorVersionRecord version, boolean created) {
    }

    public boolean retire(String name) {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE factors SET retired_at = :now WHERE name = :n AND retired_at IS NULL")
                .bind("n", name).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).execute()) > 0;
    }

    /**
     * Stores a build in one transaction: with {@code replaceFrom} set, rows on or after it are replaced (a revision);
     * with it null and {@code append} false, the whole series is replaced; with {@code append} true, rows are added.
     * Marks the version ready and bumps its data version, so series ETags change.
     */
    public void saveBuild(long factorId, int version, List<StoredReturn> returns, List<StoredTurnover> turnover,
                          byte[] engineState, String reportJson, boolean append, LocalDate replaceFrom) {
        jdbi.useTransaction(h -> {
            if (!append) {
                String cut = replaceFrom == null ? "" : " AND obs_date >= :from";
                var del = h.createUpdate("DELETE FROM factor_returns WHERE factor_id = :f AND version = :v" + cut)
                        .bind("f", factorId).bind("v", version);
                if (replaceFrom != null) {
                    del.bind("from", replaceFrom);
                }
                del.execute();
                var delT = h.createUpdate("DELETE FROM factor_turnover WHERE factor_id = :f AND version = :v"
                                + (replaceFrom == null ? "" : " AND formation_date >= :from"))
                        .bind("f", factorId).bind("v", version);
                if (replaceFrom != null) {
                    delT.bind("from", replaceFrom);
                }
                delT.execute();
            }
            insertReturns(h, factorId, version, returns);
            PreparedBatch tb = h.prepareBatch("INSERT INTO factor_turnover (factor_id, version, formation_date, turnover) VALUES (:f, :v, :d, :t)");
            for (StoredTurnover t : turnover) {
                tb.bind("f", factorId).bind("v", version).bind("d", t.formationDate()).bind("t", t.turnover()).add();
            }
            if (!turnover.isEmpty()) {
                tb.execute();
            }
            h.createUpdate("UPDATE factor_versions SET status = 'ready', data_version = data_version + 1, engine_state = :s, "
                            + "build_report = :r, built_at = :now WHERE factor_id = :f AND version = :v")
                    .bind("s", engineState).bind("r", reportJson).bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                    .bind("f", factorId).bind("v", version).execute();
        });
    }

    /**
     * Stores an uploaded external series in one transaction: appended rows are added; revised rows replace the
     * stored rows of the same dates. Bumps the data version.
     */
    public void saveExternal(long factorId, int version, List<StoredReturn> returns, boolean revise) {
        jdbi.useTransaction(h -> {
            if (revise) {
                PreparedBatch del = h.prepareBatch("DELETE FROM factor_returns WHERE factor_id = :f AND version = :v AND obs_date = :d");
                for (StoredReturn r : returns) {
                    del.bind("f", factorId).bind("v", version).bind("d", r.date()).add();
                }
                if (!returns.isEmpty()) {
                    del.execute();
                }
            }
            insertReturns(h, factorId, version, returns);
            h.createUpdate("UPDATE factor_versions SET status = 'ready', data_version = data_version + 1, built_at = :now "
                            + "WHERE factor_id = :f AND version = :v")
                    .bind("now", OffsetDateTime.now(ZoneOffset.UTC)).bind("f", factorId).bind("v", version).execute();
        });
    }

    private static void insertReturns(Handle h, long factorId, int version, List<StoredReturn> returns) {
        if (returns.isEmpty()) {
            return;
        }
        PreparedBatch batch = h.prepareBatch("INSERT INTO factor_returns (factor_id, version, obs_date, spread, long_leg, short_leg, net) "
                + "VALUES (:f, :v, :d, :s, :l, :sh, :n)");
        for (StoredReturn r : returns) {
            batch.bind("f", factorId).bind("v", version).bind("d", r.date()).bind("s", r.spread())
                    .bind("l", nullable(r.longLeg())).bind("sh", nullable(r.shortLeg())).bind("n", nullable(r.net()))
                    .add();
        }
        batch.execute();
    }

    private static Double nullable(double v) {
        return Double.isNaN(v) ? null : v;
    }

    public void markFailed(long factorId, int version, String reportJson) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE factor_versions SET status = 'failed', build_report = :r, built_at = :now "
                        + "WHERE factor_id = :f AND version = :v")
                .bind("r", reportJson).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).bind("f", factorId).bind("v", version).execute());
    }

    public byte[] engineState(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT engine_state FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).map((rs, ctx) -> rs.getBytes(1)).one());
    }

    /** A series of one version: the spread, a leg or the net return, rows where that column is null left out. */
    public ReturnSeries series(long factorId, int version, Leg leg) {
        long dataVersion = jdbi.withHandle(h -> h.createQuery("SELECT data_version FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).mapTo(Long.class).findOne().orElse(-1L));
        SeriesKey key = new SeriesKey(factorId, version, leg);
        CachedSeries cached = recentSeries.get(key);
        if (cached != null && cached.dataVersion() == dataVersion) {
            return cached.series();
        }
        ReturnSeries series = readSeries(factorId, version, leg);
        recentSeries.put(key, new CachedSeries(dataVersion, series));
        return series;
    }

    private ReturnSeries readSeries(long factorId, int version, Leg leg) {
        List<LocalDate> dates = new ArrayList<>();
        List<Double> values = new ArrayList<>();
        jdbi.useHandle(h -> h.createQuery("SELECT obs_date, " + leg.column + " FROM factor_returns WHERE factor_id = :f AND version = :v "
                        + "AND " + leg.column + " IS NOT NULL ORDER BY obs_date")
                .bind("f", factorId).bind("v", version)
                .map((rs, ctx) -> readPoint(rs))
                .forEach(p -> {
                    dates.add(p.date());
                    values.add(p.value());
                }));
        double[] v = new double[values.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = values.get(i);
        }
        return new ReturnSeries(dates.toArray(new LocalDate[0]), v);
    }

    private record Point(LocalDate date, double value) {
    }

    private static Point readPoint(ResultSet rs) throws SQLException {
        return new Point(rs.getObject(1, LocalDate.class), rs.getDouble(2));
    }

    public List<StoredTurnover> turnover(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT formation_date, turnover FROM factor_turnover WHERE factor_id = :f AND version = :v "
                        + "ORDER BY formation_date")
                .bind("f", factorId).bind("v", version)
                .map((rs, ctx) -> new StoredTurnover(rs.getObject(1, LocalDate.class), rs.getDouble(2)))
                .list());
    }

    public SeriesSummary seriesSummary(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT MIN(obs_date), MAX(obs_date), COUNT(*) FROM factor_returns WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version)
                .map((rs, ctx) -> new SeriesSummary(rs.getObject(1, LocalDate.class), rs.getObject(2, LocalDate.class), rs.getInt(3)))
                .one());
    }
}
