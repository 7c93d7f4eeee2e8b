package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/** API tokens: only SHA-256 hashes are stored. */
public final class TokenStore {
    private final Jdbi jdbi;

    public TokenStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    public record TokenRecord(String name, String scope, String tokenHash, OffsetDateTime createdAt) {
    }

    /** Every token with the epoch they were read at, in one transaction. */
    public record Snapshot(long epoch, List<TokenRecord> tokens) {
    }

    public Snapshot snapshot() {
        return jdbi.inTransaction(h -> new Snapshot(epoch(h), all(h)));
    }

    /** The token epoch: it changes with every insert and delete, by any instance. */
    public long epoch() {
        return jdbi.withHandle(TokenStore::epoch);
    }

    private static long epoch(org.jdbi.v3.core.Handle h) {
        return h.createQuery("SELECT epoch FROM token_epoch WHERE id = 1").mapTo(Long.class).one();
    }

    private static void bumpEpoch(org.jdbi.v3.core.Handle h) {
        h.createUpdate("UPDATE token_epoch SET epoch = epoch + 1 WHERE id = 1").execute();
    }

    public List<TokenRecord> all() {
        return jdbi.withHandle(TokenStore::all);
    }

    private static List<TokenRecord> all(org.jdbi.v3.core.Handle h) {
        return h.createQuery("SELECT name, scope, token_hash, created_at FROM api_tokens ORDER BY name")
                .map((rs, ctx) -> new TokenRecord(rs.getString(1), rs.getString(2), rs.getString(3),
                        rs.getObject(4, OffsetDateTime.class)))
                .list();
    }

    /** Inserts a token; false when the name is taken. */
    public boolean insert(String name, String scope, String tokenHash) {
        return jdbi.inTransaction(h -> {
            boolean exists = h.createQuery("SELECT COUNT(*) FROM api_tokens WHERE name = :name")
                    .bind("name", name).mapTo(Integer.class).one() > 0;
            if (exists) {
                return false;
            }
            h.createUpdate("INSERT INTO api_tokens (name, scope, token_hash, created_at) VALUES (:name, :scope, :hash, :now)")
                    .bind("name", name).bind("scope", scope).bind("hash", tokenHash)
                    .bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                    .execute();
            bumpEpoch(h);
            return true;
        });
    }

    public boolean delete(String name) {
        return jdbi.inTransaction(h -> {
            int deleted = h.createUpdate("DELETE FROM api_tokens WHERE name = :name").bind("name", name).execute();
            bumpEpoch(h);
            return deleted;
        }) > 0;
    }

    public boolean anyWithScope(String scope) {
        return jdbi.withHandle(h -> h.createQuery("SELECT COUNT(*) FROM api_tokens WHERE scope = :scope")
                .bind("scope", scope).mapTo(Integer.class).one()) > 0;
    }
}
