package dev.winnow.api;

import dev.winnow.store.ChangeFeed;
import dev.winnow.store.TokenStore;
import dev.winnow.store.TokenStore.TokenRecord;
import io.javalin.http.Context;
import io.javalin.http.HandlerType;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.security.SecureRandom;
import java.util.Base64;
import java.util.HexFormat;
import java.util.List;

/**
 * Bearer-token authentication. Tokens are 32 random bytes; only their SHA-256 is stored. A presented token is
 * hashed and compared with every stored hash in constant time ({@link MessageDigest#isEqual}), without early exit.
 * The stored hashes are held in memory and reloaded whenever the token store announces a commit on its
 * {@link ChangeFeed} (creation or revocation), so a check costs no query and a revocation holds from the next request.
 */
public final class Authenticator {
    private static final SecureRandom RANDOM = new SecureRandom();

    private final TokenStore tokens;
    private volatile Known known;

    /** The stored hashes as bytes, with the scope of each, at a version of the token feed. */
    private record Known(long feedVersion, byte[][] hashes, Scope[] scopes) {
    }

    public Authenticator(TokenStore tokens) {
        this.tokens = tokens;
        known();
    }

    /**
     * The hashes as of the token feed's current version. The version is read before the query, so a change that
     * commits during the load leaves a newer version behind and the next check loads again.
     */
    private Known known() {
        long version = tokens.feed().version(ChangeFeed.Topic.TOKENS);
        Known k = known;
        if (k != null && k.feedVersion() == version) {
            return k;
        }
        List<TokenRecord> all = tokens.all();
        byte[][] hashes = new byte[all.size()][];
        Scope[] scopes = new Scope[all.size()];
        for (int i = 0; i < hashes.length; i++) {
            hashes[i] = all.get(i).tokenHash().getBytes(StandardCharsets.US_ASCII);
            scopes[i] = Scope.fromWireName(all.get(i).scope());
        }
        Known loaded = new Known(version, hashes, scopes);
        known = loaded;
        return loaded;
    }

    public static String newToken() {
        byte[] bytes = new byte[32];
        RANDOM.nextBytes(bytes);
        return "wn_" + Base64.getUrlEncoder().withoutPadding().encodeToString(bytes);
    }

    public static String hash(String token) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(token.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is missing from this JVM", e);
        }
    }

    /** Before-handler: 401 without a known token, 403 when its scope is below what the route needs. */
    public void check(Context ctx) {
        if (ctx.path().equals("/health") || PageRoutes.isPublic(ctx.path()) || ctx.method() == HandlerType.OPTIONS) {
            return;
        }
        String header = ctx.header("Authorization");
        if (header == null || !header.regionMatches(true, 0, "Bearer ", 0, 7) || header.length() <= 7) {
            ctx.header("WWW-Authenticate", "Bearer");
            throw new ApiProblem(401, "Unauthorized", "Send 'Authorization: Bearer <token>'. Ask an admin for a token (POST /v1/tokens).");
        }
        Scope scope = scopeOf(header.substring(7).trim());
        if (scope == null) {
            ctx.header("WWW-Authenticate", "Bearer error=\"invalid_token\"");
            throw new ApiProblem(401, "Unauthorized", "The bearer token is unknown or revoked; ask an admin for a valid token.");
        }
        Scope required = requiredScope(ctx);
        if (!scope.covers(required)) {
            throw new ApiProblem(403, "Forbidden", "This request needs a token with scope '" + required.wireName()
                    + "'; yours has scope '" + scope.wireName() + "'.");
        }
    }

    private Scope scopeOf(String token) {
        byte[] presented = hash(token).getBytes(StandardCharsets.US_ASCII);
        Known k = known();
        Scope found = null;
        for (int i = 0; i < k.hashes().length; i++) {
            if (MessageDigest.isEqual(presented, k.hashes()[i])) {
                found = k.scopes()[i];
            }
        }
        return found;
    }

    static Scope requiredScope(Context ctx) {
        String path = ctx.path();
        if (path.startsWith("/v1/tokens") || path.startsWith("/v1/admin/")) {
            return Scope.ADMIN;
        }
        HandlerType method = ctx.method();
        if (method == HandlerType.GET || method == HandlerType.HEAD) {
            return Scope.READ;
        }
        if (method == HandlerType.POST && (path.equals("/v1/exposures") || path.equals("/v1/risk") || path.equals("/v1/fama-macbeth"))) {
            return Scope.READ;
        }
        return Scope.WRITE;
    }
}
