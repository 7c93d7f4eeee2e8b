package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.stats.Frequency;
import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;

import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Panels and their slices. An upload stages slices under its own id; {@link #commitUpload} makes them visible
 * in one transaction, {@link #discardUpload} removes every trace of an upload that did not commit.
 */
public final class PanelStore {
    private static final String PANEL_COLUMNS = "id, name, first_date, last_date, date_count, row_count, security_count, frequency, data_version";
    private static final RowMapper<PanelRecord> PANEL = (rs, ctx) -> new PanelRecord(
            rs.getLong(1), rs.getString(2), rs.getObject(3, LocalDate.class), rs.getObject(4, LocalDate.class),
            rs.getInt(5), rs.getLong(6), rs.getInt(7), rs.getString(8), rs.getLong(9));
    private static final String VISIBLE = "JOIN uploads u ON u.id = s.upload_id AND u.state = 'committed'";

    private final Jdbi jdbi;
    private final PanelReadAhead readAhead;

    /** @param readAhead the threads its {@link #source sources} read the next block on, shared with the service */
    public PanelStore(Jdbi jdbi, PanelReadAhead readAhead) {
        this.jdbi = jdbi;
        this.readAhead = java.util.Objects.requireNonNull(readAhead, "readAhead");
    }

    /** The committed panel read in date order, every extra column decoded ({@link StorePanelSource}). */
    public StorePanelSource source(long panelId) {
        return source(panelId, name -> true);
    }

    /**
     * The committed panel read in date order, decoding only the extra columns {@code columns} accepts (ids, returns
     * and market caps always); the others read as absent.
     */
    public StorePanelSource source(long panelId, java.util.function.Predicate<String> columns) {
        return new StorePanelSource(this, readAhead, panelId, columns);
    }

    public record PanelRecord(long id, String name, LocalDate firstDate, LocalDate lastDate, int dateCount, long rowCount,
                              int securityCount, String frequency, long dataVersion) {
        /** A panel exists for readers once an upload of it has committed. */
        public boolean visible() {
            return dataVersion > 0;
        }
    }

    public record ColumnRecord(String name, String type) {
    }

    public Optional<PanelRecord> find(String name) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + PANEL_COLUMNS + " FROM panels WHERE name = :name")
                .bind("name", name).map(PANEL).findOne());
    }

    public Optional<PanelRecord> find(long id) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + PANEL_COLUMNS + " FROM panels WHERE id = :id")
                .bind("id", id).map(PANEL).findOne());
    }

    public List<PanelRecord> listVisible() {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + PANEL_COLUMNS + " FROM panels WHERE data_version > 0 ORDER BY name")
                .map(PANEL).list());
    }

    /** Column name to type ("number" or "label") of the committed extra columns, in the order they were added. */
    public Map<String, String> columns(long panelId) {
        Map<String, String> columns = new LinkedHashMap<>();
        jdbi.useHandle(h -> h.createQuery("SELECT c.name, c.type FROM panel_columns c JOIN uploads u ON u.id = c.upload_id "
                        + "WHERE c.panel_id = :p AND u.state = 'committed' ORDER BY c.upload_id, c.name")
                .bind("p", panelId)
                .map((rs, ctx) -> new ColumnRecord(rs.getString(1), rs.getString(2)))
                .forEach(c -> columns.put(c.name(), c.type())));
        return columns;
    }

    public long createPanelIfAbsent(String name) {
        return jdbi.inTransaction(h -> {
            Optional<Long> id = h.createQuery("SELECT id FROM panels WHERE name = :name").bind("name", name).mapTo(Long.class).findOne();
            if (id.isPresent()) {
                return id.get();
            }
            return h.createUpdate("INSERT INTO panels (name, date_count, row_count, security_count, data_version, created_at) "
                            + "VALUES (:name, 0, 0, 0, 0, :now)")
                    .bind("name", name).bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                    .executeAndReturnGeneratedKeys("id").mapTo(Long.class).one();
        });
    }

    /** The dates of a job's upload if it already committed (a job queued again after a crash must not apply twice). */
    public Optional<List<LocalDate>> committedUploadDates(long jobId) {
        return jdbi.withHandle(h -> {
            Optional<Long> upload = h.createQuery("SELECT id FROM uploads WHERE job_id = :j AND state = 'committed'")
                    .bind("j", jobId).mapTo(Long.class).findOne();
            return upload.map(id -> h.createQuery("SELECT slice_date FROM panel_slices WHERE upload_id = :u ORDER BY slice_date")
                    .bind("u", id).mapTo(LocalDate.class).list());
        });
    }

    public long beginUpload(long panelId, long jobId, String mode) {
        return jdbi.withHandle(h -> h.createUpdate("INSERT INTO uploads (panel_id, job_id, mode, state, created_at) "
                        + "VALUES (:p, :j, :m, 'staging', :now)")
                .bind("p", panelId).bind("j", jobId).bind("m", mode).bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                .executeAndReturnGeneratedKeys("id").mapTo(Long.class).one());
    }

    /** The panel's security dictionary; new codes get the next ids and are recorded against the staging upload. */
    public SecurityDictionary securityDictionary(long panelId, long uploadId) {
        return dictionary(panelId, uploadId, false);
    }

    /** As {@link #securityDictionary}, writing new codes in batches: call {@link SecurityDictionary#flush} before the commit. */
    public SecurityDictionary batchedSecurityDictionary(long panelId, long uploadId) {
        return dictionary(panelId, uploadId, true);
    }

    private SecurityDictionary dictionary(long panelId, long uploadId, boolean batched) {
        Map<String, Integer> ids = new HashMap<>();
        jdbi.useHandle(h -> h.createQuery("SELECT code, security_id FROM panel_securities WHERE panel_id = :p")
                .bind("p", panelId)
                .map((rs, ctx) -> Map.entry(rs.getString(1), rs.getInt(2)))
                .forEach(e -> ids.put(e.getKey(), e.getValue())));
        return new SecurityDictionary(jdbi, panelId, uploadId, ids, batched);
    }

    /** Codes by security id, for responses that name securities. */
    public Map<Integer, String> securityCodes(long panelId) {
        Map<Integer, String> codes = new HashMap<>();
        jdbi.useHandle(h -> h.createQuery("SELECT security_id, code FROM panel_securities WHERE panel_id = :p")
                .bind("p", panelId)
                .map((rs, ctx) -> Map.entry(rs.getInt(1), rs.getString(2)))
                .forEach(e -> codes.put(e.getKey(), e.getValue())));
        return codes;
    }

    public void stageSlice(long panelId, long uploadId, CrossSection cs) {
        byte[] payload = CrossSectionCodec.encode(cs);
        jdbi.useTransaction(h -> {
            h.createUpdate("INSERT INTO panel_slices (panel_id, slice_date, upload_id, row_count) VALUES (:p, :d, :u, :n)")
                    .bind("p", panelId).bind("d", cs.date()).bind("u", uploadId).bind("n", cs.size()).execute();
            h.createUpdate("INSERT INTO slice_payloads (panel_id, slice_date, upload_id, payload) VALUES (:p, :d, :u, :b)")
                    .bind("p", panelId).bind("d", cs.date()).bind("u", uploadId).bind("b", payload).execute();
        });
    }

    /**
     * Makes a staged upload visible: replaces earlier slices of the same dates (revisions), records new columns,
     * refreshes the panel's statistics and bumps its data version, all in one transaction.
     */
    public void commitUpload(long panelId, long uploadId, Map<String, String> newColumns) {
        jdbi.useTransaction(h -> {
            JobLease.hold(h);
            List<long[]> superseded = new ArrayList<>();
            h.createQuery("SELECT s.upload_id, s.slice_date FROM panel_slices s " + VISIBLE
                            + " WHERE s.panel_id = :p AND s.slice_date IN (SELECT slice_date FROM panel_slices WHERE upload_id = :u)")
                    .bind("p", panelId).bind("u", uploadId)
                    .map((rs, ctx) -> new long[] {rs.getLong(1), rs.getObject(2, LocalDate.class).toEpochDay()})
                    .forEach(superseded::add);
            for (long[] old : superseded) {
                LocalDate date = LocalDate.ofEpochDay(old[1]);
                h.createUpdate("DELETE FROM slice_payloads WHERE panel_id = :p AND slice_date = :d AND upload_id = :u")
                        .bind("p", panelId).bind("d", date).bind("u", old[0]).execute();
                h.createUpdate("DELETE FROM panel_slices WHERE panel_id = :p AND slice_date = :d AND upload_id = :u")
                        .bind("p", panelId).bind("d", date).bind("u", old[0]).execute();
            }
            for (Map.Entry<String, String> c : newColumns.entrySet()) {
                h.createUpdate("INSERT INTO panel_columns (panel_id, name, type, upload_id) VALUES (:p, :n, :t, :u)")
                        .bind("p", panelId).bind("n", c.getKey()).bind("t", c.getValue()).bind("u", uploadId).execute();
            }
            h.createUpdate("UPDATE uploads SET state = 'committed' WHERE id = :u").bind("u", uploadId).execute();
            refreshStatistics(h, panelId);
        });
    }

    private static void refreshStatistics(Handle h, long panelId) {
        List<LocalDate> dates = h.createQuery("SELECT s.slice_date FROM panel_slices s " + VISIBLE + " WHERE s.panel_id = :p ORDER BY s.slice_date")
                .bind("p", panelId).mapTo(LocalDate.class).list();
        long rows = h.createQuery("SELECT COALESCE(SUM(s.row_count), 0) FROM panel_slices s " + VISIBLE + " WHERE s.panel_id = :p")
                .bind("p", panelId).mapTo(Long.class).one();
        int securities = h.createQuery("SELECT COUNT(*) FROM panel_securities c JOIN uploads u ON u.id = c.upload_id "
                        + "AND u.state = 'committed' WHERE c.panel_id = :p")
                .bind("p", panelId).mapTo(Integer.class).one();
        h.createUpdate("UPDATE panels SET first_date = :f, last_date = :l, date_count = :n, row_count = :r, security_count = :s, "
                        + "frequency = :freq, data_version = data_version + 1 WHERE id = :p")
                .bind("p", panelId)
                .bind("f", dates.isEmpty() ? null : dates.get(0))
                .bind("l", dates.isEmpty() ? null : dates.get(dates.size() - 1))
                .bind("n", dates.size()).bind("r", rows).bind("s", securities)
                .bind("freq", Frequency.fromDates(dates).wireName())
                .execute();
    }

    /** Removes every trace of an upload that did not commit. */
    public void discardUpload(long uploadId) {
        jdbi.useTransaction(h -> discard(h, uploadId));
    }

    /**
     * Discards what a job staged and did not commit: after it failed on a storage fault, or before it runs again
     * when an earlier run's worker died before the commit. Returns how many uploads.
     */
    public int discardStagingOfJob(long jobId) {
        return jdbi.inTransaction(h -> {
            List<Long> staging = h.createQuery("SELECT id FROM uploads WHERE state = 'staging' AND job_id = :j")
                    .bind("j", jobId).mapTo(Long.class).list();
            for (long id : staging) {
                discard(h, id);
            }
            return staging.size();
        });
    }

    /** At start-up of the only process on an embedded store: discards uploads a crash left in staging. Returns how many. */
    public int discardAllStaging() {
        return jdbi.inTransaction(h -> {
            List<Long> staging = h.createQuery("SELECT id FROM uploads WHERE state = 'staging'").mapTo(Long.class).list();
            for (long id : staging) {
                discard(h, id);
            }
            return staging.size();
        });
    }

    private static void discard(Handle h, long uploadId) {
        h.createUpdate("DELETE FROM slice_payloads WHERE upload_id = :u").bind("u", uploadId).execute();
        h.createUpdate("DELETE FROM panel_slices WHERE upload_id = :u").bind("u", uploadId).execute();
        h.createUpdate("DELETE FROM panel_securities WHERE upload_id = :u").bind("u", uploadId).execute();
        h.createUpdate("DELETE FROM panel_columns WHERE upload_id = :u").bind("u", uploadId).execute();
        h.createUpdate("UPDATE uploads SET state = 'discarded' WHERE id = :u").bind("u", uploadId).execute();
    }

    /** The visible grid of the panel: its distinct dates, ascending. */
    public List<LocalDate> dates(long panelId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT s.slice_date FROM panel_slices s " + VISIBLE + " WHERE s.panel_id = :p ORDER BY s.slice_date")
                .bind("p", panelId).mapTo(LocalDate.class).list());
    }

    /**
     * The visible cross-sections at consecutive grid dates (ascending, from {@link #dates}) in one query, decoding only
     * the extra columns {@code columns} accepts; a date without a visible slice gets an empty cross-section.
     */
    public List<CrossSection> slices(long panelId, List<LocalDate> gridDates, java.util.function.Predicate<String> columns) {
        if (gridDates.isEmpty()) {
            return List.of();
        }
        Map<LocalDate, byte[]> payloads = new HashMap<>();
        jdbi.useHandle(h -> h.createQuery("SELECT p.slice_date, p.payload FROM slice_payloads p JOIN uploads u ON u.id = p.upload_id "
                        + "AND u.state = 'committed' WHERE p.panel_id = :p AND p.slice_date >= :from AND p.slice_date <= :to")
                .bind("p", panelId).bind("from", gridDates.get(0)).bind("to", gridDates.get(gridDates.size() - 1))
                .map((rs, ctx) -> Map.entry(rs.getObject(1, LocalDate.class), payloadOf(rs, 2)))
                .forEach(e -> payloads.put(e.getKey(), e.getValue())));
        List<CrossSection> out = new ArrayList<>(gridDates.size());
        for (LocalDate date : gridDates) {
            byte[] payload = payloads.remove(date);
            out.add(payload == null ? new CrossSection(date, new int[0], new double[0], new double[0], Map.of(), Map.of())
                    : CrossSectionCodec.decode(date, payload, columns));
        }
        return out;
    }

    /**
     * A payload column's bytes without the copy {@code getBytes} makes of each one. H2 answers
     * {@code getBinaryStream} with a {@link java.io.ByteArrayInputStream} over the value it read, and that stream's
     * {@code transferTo} hands its array to the sink in one write: when that write is the whole array and all the
     * stream held ({@code available()}, exact for that class), the array is returned as it is. A build reads some
     * 300 MB of payloads this way; their copies were about a sixth of what it allocated. The array may be the store's
     * own, so it is only ever read (decoded), never written. PostgreSQL's driver hands over the same class, over an
     * array it has just made; any other stream, or one over a part of an array, is read into an array of its own.
     *
     * @throws java.sql.SQLException when the column cannot be read
     */
    static byte[] payloadOf(java.sql.ResultSet rs, int column) throws java.sql.SQLException {
        try (java.io.InputStream in = rs.getBinaryStream(column)) {
            if (in == null) {
                return null;
            }
            if (in.getClass() != java.io.ByteArrayInputStream.class) {
                return in.readAllBytes();
            }
            WholeArray sink = new WholeArray(in.available());
            in.transferTo(sink);
            return sink.bytes();
        } catch (java.io.IOException e) {
            throw new java.sql.SQLException("could not read a slice payload", e);
        }
    }

    /**
     * Keeps the array of a write that is exactly the {@code size} bytes announced, from its first byte to its last;
     * copies any other write. Bytes beyond those announced are refused: they would mean the kept array was not the
     * stream's whole content.
     */
    private static final class WholeArray extends java.io.OutputStream {
        private final int size;
        private byte[] whole;
        private final java.io.ByteArrayOutputStream pieces = new java.io.ByteArrayOutputStream(0);

        WholeArray(int size) {
            this.size = size;
        }

        @Override
        public void write(int b) {
            write(new byte[] {(byte) b}, 0, 1);
        }

        @Override
        public void write(byte[] b, int off, int len) {
            if (len == 0) {
                return;
            }
            if (whole != null || pieces.size() + len > size) {
                throw new IllegalStateException("a payload stream gave more bytes than it announced (" + size + ")");
            }
            if (pieces.size() == 0 && off == 0 && len == size && b.length == size) {
                whole = b;
            } else {
                pieces.write(b, off, len);
            }
        }

        byte[] bytes() {
            return whole != null ? whole : pieces.toByteArray();
        }
    }

    /** Stages the slices of an upload from a background thread, in batches (see {@link SliceStager}). */
    public SliceStager stager(long panelId, long uploadId) {
        return new SliceStager(jdbi, panelId, uploadId);
    }

    /** The visible cross-section at a date, or an empty one when the panel has no rows there. */
    public CrossSection slice(long panelId, LocalDate date) {
        return jdbi.withHandle(h -> h.createQuery("SELECT p.payload FROM slice_payloads p JOIN uploads u ON u.id = p.upload_id "
                        + "AND u.state = 'committed' WHERE p.panel_id = :p AND p.slice_date = :d")
                .bind("p", panelId).bind("d", date)
                .map((rs, ctx) -> payloadOf(rs, 1))
                .findOne()
                .map(bytes -> CrossSectionCodec.decode(date, bytes))
                .orElseGet(() -> new CrossSection(date, new int[0], new double[0], new double[0], Map.of(), Map.of())));
    }
}
