package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;

/** Variant families: the declaration, the latest build job and which factor is variant n. */
public final class FamilyStore {
    private static final String FAMILY_COLUMNS = "id, name, spec, job_id, created_at, updated_at, retired_at";
    private static final RowMapper<FamilyRecord> FAMILY = (rs, ctx) -> new FamilyRecord(rs.getLong(1), rs.getString(2),
            rs.getString(3), (Long) rs.getObject(4, Long.class), rs.getObject(5, OffsetDateTime.class),
            rs.getObject(6, OffsetDateTime.class), rs.getObject(7, OffsetDateTime.class));
    private static final RowMapper<VariantRecord> VARIANT = (rs, ctx) -> new VariantRecord(rs.getInt(1), rs.getLong(2),
            rs.getString(3), rs.getString(4), rs.getBoolean(5));

    private final Jdbi jdbi;

    public FamilyStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    public record FamilyRecord(long id, String name, String specJson, Long jobId, OffsetDateTime createdAt,
                               OffsetDateTime updatedAt, OffsetDateTime retiredAt) {
        public boolean retired() {
            return retiredAt != null;
        }
    }

    /** Variant n of a family: its factor and the parameter values it was declared with. */
    public record VariantRecord(int n, long factorId, String factorName, String parametersJson, boolean active) {
    }

    /** A variant as declared: its number, factor name and parameters. */
    public record DeclaredVariant(int n, String factorName, String parametersJson) {
    }

    public Optional<FamilyRecord> find(String name) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + FAMILY_COLUMNS + " FROM families WHERE name = :n")
                .bind("n", name).map(FAMILY).findOne());
    }

    /** Live (not deleted) families by name. */
    public List<FamilyRecord> listLive() {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + FAMILY_COLUMNS + " FROM families WHERE retired_at IS NULL ORDER BY name")
                .map(FAMILY).list());
    }

    /** Every variant ever declared, active ones and those a later declaration dropped, in n order. */
    public List<VariantRecord> variants(long familyId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT fv.n, fv.factor_id, f.name, fv.parameters, fv.active "
                        + "FROM family_variants fv JOIN factors f ON f.id = fv.factor_id WHERE fv.family_id = :id ORDER BY fv.n")
                .bind("id", familyId).map(VARIANT).list());
    }

    /**
     * Records a declaration in one transaction: the family row (created, or updated and brought back if deleted),
     * its variants (whose factors must exist) marked active, and every other variant of the family inactive; each
     * variant's factor is tagged with the family.
     */
    public FamilyRecord declare(String name, String specJson, List<DeclaredVariant> variants) {
        return jdbi.inTransaction(h -> {
            OffsetDateTime now = OffsetDateTime.now(ZoneOffset.UTC);
            Optional<Long> existing = h.createQuery("SELECT id FROM families WHERE name = :n").bind("n", name).mapTo(Long.class).findOne();
            long id;
            if (existing.isEmpty()) {
                id = h.createUpdate("INSERT INTO families (name, spec, job_id, created_at, updated_at) VALUES (:n, :s, NULL, :now, :now)")
                        .bind("n", name).bind("s", specJson).bind("now", now).executeAndReturnGeneratedKeys("id").mapTo(Long.class).one();
            } else {
                id = existing.get();
                h.createUpdate("UPDATE families SET spec = :s, updated_at = :now, retired_at = NULL WHERE id = :id")
                        .bind("s", specJson).bind("now", now).bind("id", id).execute();
            }
            h.createUpdate("UPDATE family_variants SET active = FALSE WHERE family_id = :id").bind("id", id).execute();
            for (DeclaredVariant v : variants) {
                long factorId = h.createQuery("SELECT id FROM factors WHERE name = :n").bind("n", v.factorName()).mapTo(Long.class).one();
                h.createUpdate("UPDATE factors SET family_id = :fam WHERE id = :f").bind("fam", id).bind("f", factorId).execute();
                int updated = h.createUpdate("UPDATE family_variants SET factor_id = :f, parameters = :p, active = TRUE "
                                + "WHERE family_id = :id AND n = :n")
                        .bind("f", factorId).bind("p", v.parametersJson()).bind("id", id).bind("n", v.n()).execute();
                if (updated == 0) {
                    h.createUpdate("INSERT INTO family_variants (family_id, n, factor_id, parameters, active) VALUES (:id, :n, :f, :p, TRUE)")
                            .bind("id", id).bind("n", v.n()).bind("f", factorId).bind("p", v.parametersJson()).execute();
                }
            }
            return h.createQuery("SELECT " + FAMILY_COLUMNS + " FROM families WHERE id = :id").bind("id", id).map(FAMILY).one();
        });
    }

    public void setJob(long familyId, Long jobId) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE families SET job_id = :j WHERE id = :id").bind("j", jobId).bind("id", familyId).execute());
    }

    /** Marks the family deleted; its variants' factors are retired separately (their versions remain trials). */
    public boolean retire(String name) {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE families SET retired_at = :now WHERE name = :n AND retired_at IS NULL")
                .bind("n", name).bind("now", OffsetDateTime.now(ZoneOffset.UTC)).execute()) > 0;
    }
}
