package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/** API tokens: only SHA-256 hashes are stored. */
public final class TokenStore {
    private final Jdbi jdbi;
    private final ChangeFeed feed;

    public TokenStore(Jdbi jdbi, ChangeFeed feed) {
        this.jdbi = jdbi;
        this.feed = feed;
    }

    /** The feed this store announces its commits on: the authenticator refreshes its token cache from it. */
    public ChangeFeed feed() {
        return feed;
    }

    public record TokenRecord(String name, String scope, String tokenHash, OffsetDateTime createdAt) {
    }

    public List<TokenRecord> all() {
        return jdbi.withHandle(h -> h.createQuery("SELECT name, scope, token_hash, created_at FROM api_tokens ORDER BY name")
                .map((rs, ctx) -> new TokenRecord(rs.getString(1), rs.getString(2), rs.getString(3),
                        rs.getObject(4, OffsetDateTime.class)))
                .list());
    }

    /** Inserts a token; false when the name is taken. */
    public boolean insert(String name, String scope, String tokenHash) {
        return announced(jdbi.inTransaction(h -> {
            boolean exists = h.createQuery("SELECT COUNT(*) FROM api_tokens WHERE name = :name")
                    .bind("name", name).mapTo(Integer.class).one() > 0;
            if (exists) {
                return false;
            }
            h.createUpdate("INSERT INTO api_tokens (name, scope, token_hash, created_at) VALUES (:name, :scope, :hash, :now)")
                    .bind("name", name).bind("scope", scope).bind("hash", tokenHash)
                    .bind("now", OffsetDateTime.now(ZoneOffset.UTC))
                    .execute();
            return true;
        }));
    }

    private boolean announced(boolean changed) {
        if (changed) {
            feed.committed(ChangeFeed.Topic.TOKENS);
        }
        return changed;
    }

    /** What {@link #revoke} did. */
    public enum Revocation {
        REVOKED, NOT_FOUND, LAST_ADMIN
    }

    /**
     * Deletes a token unless it is the last admin token (which would lock every admin out until a restart). The
     * admin rows are locked for the check, so two concurrent revocations cannot remove the last two admins.
     */
    public synchronized Revocation revoke(String name) {
        Revocation outcome = revokeInTransaction(name);
        announced(outcome == Revocation.REVOKED);
        return outcome;
    }

    private Revocation revokeInTransaction(String name) {
        return jdbi.inTransaction(h -> {
            List<String> admins = h.createQuery("SELECT name FROM api_tokens WHERE scope = 'admin' ORDER BY name FOR UPDATE")
                    .mapTo(String.class).list();
            if (admins.size() == 1 && admins.get(0).equals(name)) {
                return Revocation.LAST_ADMIN;
            }
            int deleted = h.createUpdate("DELETE FROM api_tokens WHERE name = :name").bind("name", name).execute();
            return deleted > 0 ? Revocation.REVOKED : Revocation.NOT_FOUND;
        });
    }

    public boolean delete(String name) {
        return announced(jdbi.withHandle(h -> h.createUpdate("DELETE FROM api_tokens WHERE name = :name").bind("name", name).execute()) > 0);
    }

    public boolean anyWithScope(String scope) {
        return jdbi.withHandle(h -> h.createQuery("SELECT COUNT(*) FROM api_tokens WHERE scope = :scope")
                .bind("scope", scope).mapTo(Integer.class).one()) > 0;
    }
}
