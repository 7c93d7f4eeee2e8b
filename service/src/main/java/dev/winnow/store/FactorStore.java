package dev.winnow.store;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
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
            + "v.status, v.data_version, v.build_report, v.created_at, v.built_at, f.retired_at, "
            + "(SELECT fam.name FROM families fam WHERE fam.id = f.family_id)";
    private static final RowMapper<FactorVersionRecord> VERSION = (rs, ctx) -> new FactorVersionRecord(
            rs.getLong(1), rs.getString(2), rs.getInt(3), rs.getInt(4), rs.getString(5),
            FactorDefinition.Method.valueOf(rs.getString(6).toUpperCase(java.util.Locale.ROOT)),
            (Long) rs.getObject(7, Long.class), VersionStatus.fromWire(rs.getString(8)), rs.getLong(9), rs.getString(10),
            rs.getObject(11, OffsetDateTime.class), rs.getObject(12, OffsetDateTime.class), rs.getObject(13, OffsetDateTime.class),
            rs.getString(14));

    private static final String CHECKPOINT_COLUMNS = "processed_dates, last_date, observations, periods_without_return, state";
    private static final RowMapper<StoredCheckpoint> CHECKPOINT = (rs, ctx) -> new StoredCheckpoint(
            rs.getInt(1), rs.getObject(2, LocalDate.class), rs.getInt(3), rs.getInt(4), rs.getBytes(5));

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

    private final ChangeFeed feed;
    private final FactorCatalog catalog;

    private final java.util.concurrent.atomic.LongAdder seriesCacheHits = new java.util.concurrent.atomic.LongAdder();
    private final java.util.concurrent.atomic.LongAdder seriesCacheMisses = new java.util.concurrent.atomic.LongAdder();

    /** Series lookups answered from the cache since start (for /metrics). */
    public long seriesCacheHits() {
        return seriesCacheHits.sum();
    }

    /** Series lookups that read the store since start (for /metrics). */
    public long seriesCacheMisses() {
        return seriesCacheMisses.sum();
    }

    /** A store whose commits are announced on a feed of its own (one process, tests). */
    public FactorStore(Jdbi jdbi) {
        this(jdbi, new LocalChangeFeed());
    }

    /** A store that announces every commit on {@code feed}, which the read caches of the API watch. */
    public FactorStore(Jdbi jdbi, ChangeFeed feed) {
        this.jdbi = jdbi;
        this.feed = feed;
        this.catalog = new FactorCatalog(this, feed);
    }

    /** Factor versions in memory, for the read paths (see {@link FactorCatalog}). */
    public FactorCatalog catalog() {
        return catalog;
    }

    private void announce() {
        feed.committed(ChangeFeed.Topic.FACTORS);
    }

    public record FactorVersionRecord(long factorId, String name, int version, int currentVersion, String definitionJson,
                                      FactorDefinition.Method method, Long panelId, VersionStatus status, long dataVersion, String buildReport,
                                      OffsetDateTime createdAt, OffsetDateTime builtAt, OffsetDateTime retiredAt,
                                      String family) {
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
    public DefineOutcome define(String name, String definitionJson, FactorDefinition.Method method, Long panelId) {
        DefineOutcome outcome = defineWithRetries(name, definitionJson, method, panelId);
        if (outcome.created()) {
            announce();
        }
        return outcome;
    }

    private DefineOutcome defineWithRetries(String name, String definitionJson, FactorDefinition.Method method, Long panelId) {
        // Concurrent definitions of one factor: in this process they take turns on a lock per name; across
        // processes the factor row is locked (FOR UPDATE) and a transaction that lost a race on the unique name or
        // the (factor, version) key is run again, so versions count up without gaps or duplicates.
        synchronized (DEFINE_LOCKS[Math.floorMod(name.hashCode(), DEFINE_LOCKS.length)]) {
            for (int attempt = 1; ; attempt++) {
                try {
                    return defineOnce(name, definitionJson, method, panelId);
                } catch (RuntimeException e) {
                    if (attempt >= 20 || !lostARace(e)) {
                        throw e;
                    }
                    try {
                        Thread.sleep(java.util.concurrent.ThreadLocalRandom.current().nextLong(5, 25L * attempt));
                    } catch (InterruptedException stop) {
                        Thread.currentThread().interrupt();
                        throw e;
                    }
                }
            }
        }
    }

    private static final Object[] DEFINE_LOCKS = new Object[64];

    static {
        for (int i = 0; i < DEFINE_LOCKS.length; i++) {
            DEFINE_LOCKS[i] = new Object();
        }
    }

    /** A unique-key violation, a serialization failure, a deadlock or a lock timeout: worth another try. */
    private static boolean lostARace(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof java.sql.SQLException sql && sql.getSQLState() != null) {
                String state = sql.getSQLState();
                if (state.equals("23505") || state.equals("40001") || state.equals("40P01") || state.equals("HYT00")
                        || state.equals("55P03")) {
                    return true;
                }
            }
        }
        return false;
    }

    private DefineOutcome defineOnce(String name, String definitionJson, FactorDefinition.Method method, Long panelId) {
        return jdbi.inTransaction(h -> {
            OffsetDateTime now = OffsetDateTime.now(ZoneOffset.UTC);
            Optional<Long> existing = h.createQuery("SELECT id FROM factors WHERE name = :n FOR UPDATE").bind("n", name).mapTo(Long.class).findOne();
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
                if (current.definitionJson().equals(definitionJson) && !current.retired() && current.status() != VersionStatus.FAILED) {
                    return new DefineOutcome(current, false);
                }
                version = h.createQuery("SELECT MAX(version) FROM factor_versions WHERE factor_id = :id")
                        .bind("id", factorId).mapTo(Integer.class).one() + 1;
            }
            h.createUpdate("INSERT INTO factor_versions (factor_id, version, definition, method, panel_id, status, data_version, created_at) "
                            + "VALUES (:f, :v, :d, :m, :p, 'building', 0, :now)")
                    .bind("f", factorId).bind("v", version).bind("d", definitionJson).bind("m", DefinitionJson.wire(method))
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

    /** Makes an existing version the factor's current one (a family variant whose definition returned to it). */
    public void makeCurrent(long factorId, int version) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE factors SET current_version = :v WHERE id = :f")
                .bind("v", version).bind("f", factorId).execute());
        announce();
    }

    /** Brings a retired factor back with its current version (a re-declared family variant whose definition is unchanged). */
    public boolean unretire(String name) {
        boolean back = jdbi.withHandle(h -> h.createUpdate("UPDATE factors SET retired_at = NULL WHERE name = :n AND retired_at IS NOT NULL")
                .bind("n", name).execute()) > 0;
        if (back) {
            announce();
        }
        return back;
    }

    public boolean retire(String name) {
        boolean retired = jdbi.withHandle(h -> h.createUpdate("UPDATE factors SET retired_at = :now WHERE name = :n AND retired_at IS NULL")
                .bind("n", name).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).execute()) > 0;
        if (retired) {
            announce();
        }
        return retired;
    }

    /**
     * Stores a build in one transaction: with {@code replaceFrom} set, rows on or after it are replaced (a revision);
     * with it null and {@code append} false, the whole series is replaced; with {@code append} true, rows are added.
     * Marks the version ready and bumps its data version, so series ETags change.
     */
    public void saveBuild(long factorId, int version, List<StoredReturn> returns, List<StoredTurnover> turnover,
                          byte[] engineState, String reportJson, boolean append, LocalDate replaceFrom) {
        Replaced replaced = append ? Replaced.NOTHING : replaceFrom == null ? Replaced.EVERYTHING : Replaced.onOrAfter(replaceFrom);
        saveBuild(factorId, version, new StoredBuild(returns, turnover, List.of(), engineState, reportJson, List.of()), replaced);
    }

    /**
     * The engine state after the first {@code processedDates} grid dates of a build ({@code lastDate} the last of
     * them), with the build's cumulative counts up to there.
     */
    public record StoredCheckpoint(int processedDates, LocalDate lastDate, int observations, int periodsWithoutReturn,
                                   byte[] state) {
    }

    /**
     * What a build, extension or revision stores: new rows, new checkpoints, the end state, the report and the
     * portfolios' returns.
     */
    public record StoredBuild(List<StoredReturn> returns, List<StoredTurnover> turnover, List<StoredCheckpoint> checkpoints,
                              byte[] engineState, String reportJson, List<StoredPortfolioReturn> portfolioReturns) {
        public StoredBuild {
            returns = List.copyOf(returns);
            turnover = List.copyOf(turnover);
            checkpoints = List.copyOf(checkpoints);
            portfolioReturns = List.copyOf(portfolioReturns);
        }
    }

    /** One portfolio's return on one date (a bucket of a sort, one of the six of a 2x3 sort). */
    public record StoredPortfolioReturn(LocalDate date, String portfolio, double value) {
    }

    /**
     * Which stored rows a build replaces: observations dated on or after {@code returnsFrom}, formations on or after
     * {@code turnoverFrom}, checkpoints whose last date is on or after {@code checkpointsFrom}; all of them when
     * {@code everything}, none when the dates are null and {@code everything} is false (an append).
     */
    public record Replaced(boolean everything, LocalDate returnsFrom, LocalDate turnoverFrom, LocalDate checkpointsFrom) {
        public static final Replaced NOTHING = new Replaced(false, null, null, null);
        public static final Replaced EVERYTHING = new Replaced(true, null, null, null);

        /** Every row dated on or after {@code date}. */
        public static Replaced onOrAfter(LocalDate date) {
            return new Replaced(false, date, date, date);
        }

        /**
         * What a run resumed from a checkpoint recomputes: observations after its last date, later checkpoints, and
         * formations dated on or after its last date: the engine decides and emits a formation dated at a grid date
         * only when it processes the next date, so the resumed run emits the one dated at the checkpoint again.
         */
        public static Replaced after(StoredCheckpoint checkpoint) {
            LocalDate next = checkpoint.lastDate().plusDays(1);
            return new Replaced(false, next, checkpoint.lastDate(), next);
        }
    }

    /**
     * Stores a build in one transaction: deletes the rows it replaces, inserts its rows and checkpoints, records the
     * end state and report, marks the version ready and bumps its data version, so series ETags change.
     */
    public void saveBuild(long factorId, int version, StoredBuild build, Replaced replaced) {
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
            deleteFrom(h, "factor_returns", "obs_date", factorId, version, replaced.everything(), replaced.returnsFrom());
            deleteFrom(h, "factor_turnover", "formation_date", factorId, version, replaced.everything(), replaced.turnoverFrom());
            deleteFrom(h, "factor_checkpoints", "last_date", factorId, version, replaced.everything(), replaced.checkpointsFrom());
            deleteFrom(h, "factor_portfolio_returns", "obs_date", factorId, version, replaced.everything(), replaced.returnsFrom());
            deleteFrom(h, "factor_portfolio_dates", "obs_date", factorId, version, replaced.everything(), replaced.returnsFrom());
            insertReturns(h, factorId, version, build.returns());
            insertPortfolioReturns(h, factorId, version, build.portfolioReturns());
            insertTurnover(h, factorId, version, build.turnover());
            insertCheckpoints(h, factorId, version, build.checkpoints());
            h.createUpdate("UPDATE factor_versions SET status = 'ready', data_version = data_version + 1, engine_state = :s, "
                            + "build_report = :r, built_at = :now WHERE factor_id = :f AND version = :v")
                    .bind("s", build.engineState()).bind("r", build.reportJson()).bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                    .bind("f", factorId).bind("v", version).execute();
        });
        announce();
    }

    /** Deletes a version's rows of a table: all of them, those dated on or after {@code from}, or none (from null). */
    private static void deleteFrom(Handle h, String table, String dateColumn, long factorId, int version,
                                   boolean all, LocalDate from) {
        if (!all && from == null) {
            return;
        }
        var delete = h.createUpdate("DELETE FROM " + table + " WHERE factor_id = :f AND version = :v"
                        + (all ? "" : " AND " + dateColumn + " >= :from"))
                .bind("f", factorId).bind("v", version);
        if (!all) {
            delete.bind("from", from);
        }
        delete.execute();
    }

    /** The latest checkpoint of a version whose last date is before {@code date}, if any. */
    public Optional<StoredCheckpoint> latestCheckpointBefore(long factorId, int version, LocalDate date) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + CHECKPOINT_COLUMNS + " FROM factor_checkpoints "
                        + "WHERE factor_id = :f AND version = :v AND last_date < :d ORDER BY processed_dates DESC FETCH FIRST 1 ROWS ONLY")
                .bind("f", factorId).bind("v", version).bind("d", date).map(CHECKPOINT).findOne());
    }

    /** All checkpoints of a version, in grid order. */
    public List<StoredCheckpoint> checkpoints(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + CHECKPOINT_COLUMNS + " FROM factor_checkpoints "
                        + "WHERE factor_id = :f AND version = :v ORDER BY processed_dates")
                .bind("f", factorId).bind("v", version).map(CHECKPOINT).list());
    }

    /**
     * Stores an uploaded external series in one transaction: appended rows are added; revised rows replace the
     * stored rows of the same dates. Bumps the data version.
     */
    public void saveExternal(long factorId, int version, List<StoredReturn> returns, boolean revise) {
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
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
        announce();
    }

    /**
     * Rows per JDBC batch when a build is saved: large enough that the driver's per-batch work is negligible, small
     * enough that a batch's parameters stay a few hundred kilobytes.
     */
    private static final int BATCH_ROWS = 4096;

    /**
     * Inserts a version's rows through one plain JDBC prepared statement in batches of {@link #BATCH_ROWS}: a build
     * saves tens of thousands of rows, and binding them by name costs more than the store's own work on them. The
     * statement's first two parameters are the factor id and the version; the binder sets the others.
     */
    private static <T> void insertRows(Handle h, String sql, long factorId, int version, List<T> rows, RowBinder<T> binder) {
        if (rows.isEmpty()) {
            return;
        }
        try (java.sql.PreparedStatement ps = h.getConnection().prepareStatement(sql)) {
            ps.setLong(1, factorId);
            ps.setInt(2, version);
            int pending = 0;
            for (T row : rows) {
                binder.bind(ps, row);
                ps.addBatch();
                if (++pending == BATCH_ROWS) {
                    ps.executeBatch();
                    pending = 0;
                }
            }
            if (pending > 0) {
                ps.executeBatch();
            }
        } catch (SQLException e) {
            throw new org.jdbi.v3.core.statement.UnableToExecuteStatementException(e, null);
        }
    }

    @FunctionalInterface
    private interface RowBinder<T> {
        void bind(java.sql.PreparedStatement ps, T row) throws SQLException;
    }

    private static void insertReturns(Handle h, long factorId, int version, List<StoredReturn> returns) {
        insertRows(h, "INSERT INTO factor_returns (factor_id, version, obs_date, spread, long_leg, short_leg, net) "
                + "VALUES (?, ?, ?, ?, ?, ?, ?)", factorId, version, returns, (ps, r) -> {
                    ps.setObject(3, r.date());
                    ps.setDouble(4, r.spread());
                    setNullable(ps, 5, r.longLeg());
                    setNullable(ps, 6, r.shortLeg());
                    setNullable(ps, 7, r.net());
                });
    }

    /** One row per date of factor_portfolio_dates: every portfolio's return on it, packed ({@link #packPortfolios}). */
    private static void insertPortfolioReturns(Handle h, long factorId, int version, List<StoredPortfolioReturn> returns) {
        Map<LocalDate, List<StoredPortfolioReturn>> byDate = new java.util.TreeMap<>();
        for (StoredPortfolioReturn r : returns) {
            byDate.computeIfAbsent(r.date(), d -> new ArrayList<>()).add(r);
        }
        List<Map.Entry<LocalDate, byte[]>> rows = new ArrayList<>(byDate.size());
        byDate.forEach((date, sameDate) -> rows.add(Map.entry(date, packPortfolios(sameDate))));
        insertRows(h, "INSERT INTO factor_portfolio_dates (factor_id, version, obs_date, packed) VALUES (?, ?, ?, ?)",
                factorId, version, rows, (ps, r) -> {
                    ps.setObject(3, r.getKey());
                    ps.setBytes(4, r.getValue());
                });
    }

    /** The format byte of a packed factor_portfolio_dates row. */
    private static final int PACKED_PORTFOLIOS = 1;

    /**
     * One date's portfolio returns as the bytes of a factor_portfolio_dates row: the format byte, the number of
     * portfolios, then each one's name (modified UTF-8, as {@link java.io.DataOutput#writeUTF}) and its return's 64
     * bits, so the stored value reads back bit for bit.
     */
    static byte[] packPortfolios(List<StoredPortfolioReturn> sameDate) {
        java.io.ByteArrayOutputStream bytes = new java.io.ByteArrayOutputStream(3 + sameDate.size() * 12);
        try (java.io.DataOutputStream out = new java.io.DataOutputStream(bytes)) {
            out.writeByte(PACKED_PORTFOLIOS);
            out.writeShort(sameDate.size());
            for (StoredPortfolioReturn r : sameDate) {
                out.writeUTF(r.portfolio());
                out.writeDouble(r.value());
            }
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e); // not thrown by an in-memory stream
        }
        return bytes.toByteArray();
    }

    /** The portfolio returns of a packed row (see {@link #packPortfolios}), in the order they were packed. */
    static List<StoredPortfolioReturn> unpackPortfolios(LocalDate date, byte[] packed) {
        try (java.io.DataInputStream in = new java.io.DataInputStream(new java.io.ByteArrayInputStream(packed))) {
            int format = in.readUnsignedByte();
            if (format != PACKED_PORTFOLIOS) {
                throw new IllegalStateException("stored portfolio returns of " + date + " have an unknown format " + format);
            }
            int count = in.readUnsignedShort();
            List<StoredPortfolioReturn> out = new ArrayList<>(count);
            for (int i = 0; i < count; i++) {
                out.add(new StoredPortfolioReturn(date, in.readUTF(), in.readDouble()));
            }
            return out;
        } catch (java.io.IOException e) {
            throw new IllegalStateException("stored portfolio returns of " + date + " are cut short", e);
        }
    }

    private static void insertTurnover(Handle h, long factorId, int version, List<StoredTurnover> turnover) {
        insertRows(h, "INSERT INTO factor_turnover (factor_id, version, formation_date, turnover) VALUES (?, ?, ?, ?)",
                factorId, version, turnover, (ps, t) -> {
                    ps.setObject(3, t.formationDate());
                    ps.setDouble(4, t.turnover());
                });
    }

    private static void insertCheckpoints(Handle h, long factorId, int version, List<StoredCheckpoint> checkpoints) {
        insertRows(h, "INSERT INTO factor_checkpoints (factor_id, version, processed_dates, last_date, observations, "
                + "periods_without_return, state) VALUES (?, ?, ?, ?, ?, ?, ?)", factorId, version, checkpoints, (ps, c) -> {
                    ps.setInt(3, c.processedDates());
                    ps.setObject(4, c.lastDate());
                    ps.setInt(5, c.observations());
                    ps.setInt(6, c.periodsWithoutReturn());
                    ps.setBytes(7, c.state());
                });
    }

    /** A missing value (NaN) as SQL NULL, as the nullable leg and net columns hold it. */
    private static void setNullable(java.sql.PreparedStatement ps, int index, double v) throws SQLException {
        if (Double.isNaN(v)) {
            ps.setNull(index, java.sql.Types.DOUBLE);
        } else {
            ps.setDouble(index, v);
        }
    }

    public void markFailed(long factorId, int version, String reportJson) {
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
            h.createUpdate("UPDATE factor_versions SET status = 'failed', build_report = :r, built_at = :now "
                            + "WHERE factor_id = :f AND version = :v")
                    .bind("r", reportJson).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).bind("f", factorId).bind("v", version).execute();
        });
        announce();
    }

    public byte[] engineState(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT engine_state FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).map((rs, ctx) -> rs.getBytes(1)).one());
    }

    /** A series of one version: the spread, a leg or the net return, rows where that column is null left out. */
    public ReturnSeries series(long factorId, int version, Leg leg) {
        long dataVersion = jdbi.withHandle(h -> h.createQuery("SELECT data_version FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).mapTo(Long.class).findOne().orElse(-1L));
        return series(factorId, version, leg, dataVersion);
    }

    /**
     * The same for a version whose data version the caller already knows (from the {@link #catalog()}): no query
     * when the series of that data version is held in memory.
     */
    public ReturnSeries series(FactorVersionRecord v, Leg leg) {
        return series(v.factorId(), v.version(), leg, v.dataVersion());
    }

    private ReturnSeries series(long factorId, int version, Leg leg, long dataVersion) {
        SeriesKey key = new SeriesKey(factorId, version, leg);
        CachedSeries cached = recentSeries.get(key);
        if (cached != null && cached.dataVersion() == dataVersion) {
            seriesCacheHits.increment();
            return cached.series();
        }
        seriesCacheMisses.increment();
        CachedSeries read = jdbi.inTransaction(h -> readSeries(h, factorId, version, leg));
        recentSeries.put(key, read);
        return read.series();
    }

    /** The series with the data version it was read at, in one transaction, so the label always fits the rows. */
    private static CachedSeries readSeries(Handle h, long factorId, int version, Leg leg) {
        long dataVersion = h.createQuery("SELECT data_version FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).mapTo(Long.class).findOne().orElse(-1L);
        List<LocalDate> dates = new ArrayList<>();
        List<Double> values = new ArrayList<>();
        h.createQuery("SELECT obs_date, " + leg.column + " FROM factor_returns WHERE factor_id = :f AND version = :v "
                        + "AND " + leg.column + " IS NOT NULL ORDER BY obs_date")
                .bind("f", factorId).bind("v", version)
                .map((rs, ctx) -> readPoint(rs))
                .forEach(p -> {
                    dates.add(p.date());
                    values.add(p.value());
                });
        double[] v = new double[values.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = values.get(i);
        }
        return new CachedSeries(dataVersion, new ReturnSeries(dates.toArray(new LocalDate[0]), v));
    }

    private record Point(LocalDate date, double value) {
    }

    private static Point readPoint(ResultSet rs) throws SQLException {
        return new Point(rs.getObject(1, LocalDate.class), rs.getDouble(2));
    }

    /**
     * Every stored portfolio of a version as a series, by portfolio name (in name order; the caller orders them as
     * the definition does). Cached like {@link #series} and checked against the data version.
     */
    public Map<String, ReturnSeries> portfolios(long factorId, int version) {
        return portfolios(factorId, version, -1);
    }

    /**
     * The same for a version whose data version the caller already knows (from the {@link #catalog()}): no query
     * when the portfolios of that data version are held in memory.
     */
    public Map<String, ReturnSeries> portfolios(FactorVersionRecord v) {
        return portfolios(v.factorId(), v.version(), v.dataVersion());
    }

    private Map<String, ReturnSeries> portfolios(long factorId, int version, long knownDataVersion) {
        SeriesKey key = new SeriesKey(factorId, version, null);
        CachedPortfolios cached = recentPortfolios.get(key);
        if (cached != null && knownDataVersion >= 0 && cached.dataVersion() == knownDataVersion) {
            return cached.series();
        }
        long dataVersion = dataVersion(factorId, version);
        if (cached != null && cached.dataVersion() == dataVersion) {
            return cached.series();
        }
        Map<String, List<Point>> points = new java.util.TreeMap<>();
        boolean[] both = new boolean[2];
        jdbi.useHandle(h -> {
            // rows of versions built before factor_portfolio_dates existed, one per portfolio and date
            h.createQuery("SELECT portfolio, obs_date, ret FROM factor_portfolio_returns "
                            + "WHERE factor_id = :f AND version = :v ORDER BY portfolio, obs_date")
                    .bind("f", factorId).bind("v", version)
                    .map((rs, ctx) -> Map.entry(rs.getString(1), new Point(rs.getObject(2, LocalDate.class), rs.getDouble(3))))
                    .forEach(e -> {
                        both[0] = true;
                        points.computeIfAbsent(e.getKey(), k -> new ArrayList<>()).add(e.getValue());
                    });
            h.createQuery("SELECT obs_date, packed FROM factor_portfolio_dates WHERE factor_id = :f AND version = :v ORDER BY obs_date")
                    .bind("f", factorId).bind("v", version)
                    .map((rs, ctx) -> unpackPortfolios(rs.getObject(1, LocalDate.class), rs.getBytes(2)))
                    .forEach(day -> {
                        both[1] = true;
                        for (StoredPortfolioReturn r : day) {
                            points.computeIfAbsent(r.portfolio(), k -> new ArrayList<>()).add(new Point(r.date(), r.value()));
                        }
                    });
        });
        if (both[0] && both[1]) { // a version built before, extended since: its dates are split between the tables
            points.values().forEach(list -> list.sort(java.util.Comparator.comparing(Point::date)));
        }
        Map<String, ReturnSeries> out = new LinkedHashMap<>();
        points.forEach((name, list) -> {
            LocalDate[] dates = new LocalDate[list.size()];
            double[] values = new double[list.size()];
            for (int i = 0; i < dates.length; i++) {
                dates[i] = list.get(i).date();
                values[i] = list.get(i).value();
            }
            out.put(name, new ReturnSeries(dates, values));
        });
        Map<String, ReturnSeries> frozen = Collections.unmodifiableMap(out);
        recentPortfolios.put(key, new CachedPortfolios(dataVersion, frozen));
        return frozen;
    }

    private long dataVersion(long factorId, int version) {
        return jdbi.withHandle(h -> h.createQuery("SELECT data_version FROM factor_versions WHERE factor_id = :f AND version = :v")
                .bind("f", factorId).bind("v", version).mapTo(Long.class).findOne().orElse(-1L));
    }

    private record CachedPortfolios(long dataVersion, Map<String, ReturnSeries> series) {
    }

    private final Map<SeriesKey, CachedPortfolios> recentPortfolios = Collections.synchronizedMap(
            new LinkedHashMap<>(16, 0.75f, true) {
                @Override
                protected boolean removeEldestEntry(Map.Entry<SeriesKey, CachedPortfolios> eldest) {
                    return size() > CACHED_SERIES;
                }
            });

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
