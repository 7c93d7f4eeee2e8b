package dev.winnow.api;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The page's own files over HTTP: served without a token, with a policy that lets the page load only its own files
 * and reach only this origin; they reference nothing outside the jar; the API still needs the token.
 */
class LibraryPageEndToEndTest {
    static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    void thePageAndItsAssetsNeedNoToken() {
        TestServer.Reply page = server.get("/", null);
        assertEquals(200, page.status());
        assertTrue(page.header("Content-Type").startsWith("text/html"));
        assertTrue(page.header("Content-Security-Policy").contains("default-src 'none'"));
        assertTrue(page.header("Content-Security-Policy").contains("script-src 'self'"));
        assertEquals("nosniff", page.header("X-Content-Type-Options"));
        assertTrue(page.body().contains("<label for=\"token\">"), "the token field has a label");
        TestServer.Reply js = server.get("/ui/app.js", null);
        assertEquals(200, js.status());
        assertTrue(js.header("Content-Type").startsWith("text/javascript"));
        assertTrue(js.body().contains("sessionStorage"));
        TestServer.Reply css = server.get("/ui/app.css", null);
        assertEquals(200, css.status());
        assertTrue(css.header("Content-Type").startsWith("text/css"));
        TestServer.assertProblem(server.get("/ui/secrets.txt", null), 404);
        TestServer.assertProblem(server.get("/v1/factors", null), 401);
    }

    @Test
    void nothingIsLoadedFromElsewhereAndTheTokenNeverGoesIntoAUrl() {
        String html = server.get("/", null).body();
        String js = server.get("/ui/app.js", null).body();
        String css = server.get("/ui/app.css", null).body();
        Pattern external = Pattern.compile("(?i)(https?:)?//[a-z0-9.-]+\\.[a-z]{2,}");
        for (String text : new String[]{html, css}) {
            Matcher m = external.matcher(text);
            assertFalse(m.find(), "external reference " + (m.find(0) ? m.group() : ""));
        }
        // the script's only absolute URL is the SVG namespace name, which is an identifier, not something loaded
        Matcher m = external.matcher(js.replace("http://www.w3.org/2000/svg", ""));
        assertFalse(m.find(), "external reference in app.js");
        assertFalse(css.contains("@import") || css.contains("url("), "the style sheet loads nothing");
        assertTrue(js.contains("'Authorization': 'Bearer ' + token()"), "the token goes in the header");
        assertFalse(js.matches("(?s).*[?&]token=.*"), "the token is never a query parameter");
    }
}
