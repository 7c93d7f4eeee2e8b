package dev.winnow.api;

import io.javalin.http.Context;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.Map;

/**
 * The library page: one HTML document, its style sheet and its script, read from the jar once at start-up and
 * served without a token (they hold no data; everything the page shows it fetches from the API with the token the
 * analyst pastes). A strict Content-Security-Policy lets the page load only its own files and talk only to this
 * origin.
 */
final class PageRoutes {
    /** Path prefix of the page's assets; the authenticator lets these and {@code /} through without a token. */
    static final String ASSETS = "/ui/";

    static final String CONTENT_SECURITY_POLICY = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; "
            + "connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

    private record Asset(byte[] body, String type) {
    }

    private final Asset page;
    private final Map<String, Asset> assets;

    PageRoutes() {
        page = new Asset(read("web/index.html"), "text/html; charset=utf-8");
        assets = Map.of(
                "app.js", new Asset(read("web/app.js"), "text/javascript; charset=utf-8"),
                "app.css", new Asset(read("web/app.css"), "text/css; charset=utf-8"));
    }

    static boolean isPublic(String path) {
        return path.equals("/") || path.startsWith(ASSETS);
    }

    void page(Context ctx) {
        send(ctx, page);
    }

    void asset(Context ctx) {
        String file = ctx.pathParam("file");
        Asset asset = assets.get(file);
        if (asset == null) {
            throw ApiProblem.notFound("No page asset '" + file + "'; the page is served at /.");
        }
        send(ctx, asset);
    }

    private static void send(Context ctx, Asset asset) {
        ctx.header("Content-Security-Policy", CONTENT_SECURITY_POLICY);
        ctx.header("X-Content-Type-Options", "nosniff");
        ctx.header("Referrer-Policy", "no-referrer");
        ctx.header("Cache-Control", "no-cache");
        ctx.status(200).contentType(asset.type()).result(asset.body());
    }

    private static byte[] read(String resource) {
        try (InputStream in = PageRoutes.class.getClassLoader().getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("the jar lacks " + resource);
            }
            return in.readAllBytes();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
