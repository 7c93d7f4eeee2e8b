package dev.winnow.api;

import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The top-level openapi.yaml documents every route that {@link ApiServer} registers, under the same HTTP method.
 * The document is read as text (no YAML library): path keys are the two-space-indented keys of the top-level
 * {@code paths:} block and operations the four-space-indented method keys below them, as the Paths and Path Item
 * objects of the OpenAPI 3.1.0 specification lay them out. Surefire runs in the module directory (service/).
 */
class OpenApiDocumentTest {
    private static final Path API_SERVER_SOURCE = Path.of("src/main/java/dev/winnow/api/ApiServer.java");
    private static final Path OPENAPI_DOCUMENT = Path.of("../openapi.yaml");

    private static final Pattern ROUTE = Pattern.compile(
            "config\\.routes\\.(get|post|put|patch|delete|head|options)\\(\\s*\"([^\"]+)\"");
    private static final Pattern TOP_LEVEL_KEY = Pattern.compile("^[^\\s#][^:]*:.*$");
    private static final Pattern PATH_KEY = Pattern.compile("^ {2}['\"]?(/[^'\":]*)['\"]?:\\s*$");
    private static final Pattern OPERATION_KEY = Pattern.compile("^ {4}(get|put|post|delete|options|head|patch|trace):\\s*$");
    private static final Pattern JAVALIN_PATH_PARAMETER = Pattern.compile("<([^>]+)>");

    /** One HTTP method on one path, the method in lower case, path parameters as {name}. */
    record Route(String method, String path) implements Comparable<Route> {
        @Override
        public int compareTo(Route other) {
            int byPath = path.compareTo(other.path);
            return byPath != 0 ? byPath : method.compareTo(other.method);
        }

        @Override
        public String toString() {
            return method.toUpperCase(java.util.Locale.ROOT) + " " + path;
        }
    }

    static Set<Route> registeredRoutes(String javaSource) {
        Set<Route> routes = new TreeSet<>();
        Matcher m = ROUTE.matcher(javaSource);
        while (m.find()) {
            String path = JAVALIN_PATH_PARAMETER.matcher(m.group(2)).replaceAll("{$1}");
            routes.add(new Route(m.group(1), path));
        }
        return routes;
    }

    static Set<Route> documentedRoutes(String openApiYaml) {
        Set<Route> routes = new TreeSet<>();
        boolean inPaths = false;
        String currentPath = null;
        for (String line : openApiYaml.split("\\R")) {
            if (TOP_LEVEL_KEY.matcher(line).matches()) {
                inPaths = line.startsWith("paths:");
                currentPath = null;
                continue;
            }
            if (!inPaths) {
                continue;
            }
            Matcher path = PATH_KEY.matcher(line);
            if (path.matches()) {
                currentPath = path.group(1);
                continue;
            }
            Matcher operation = OPERATION_KEY.matcher(line);
            if (operation.matches() && currentPath != null) {
                routes.add(new Route(operation.group(1), currentPath));
            }
        }
        return routes;
    }

    static Set<Route> undocumented(String javaSource, String openApiYaml) {
        Set<Route> missing = new TreeSet<>(registeredRoutes(javaSource));
        missing.removeAll(documentedRoutes(openApiYaml));
        return missing;
    }

    @Test
    void everyRegisteredRouteIsDocumentedWithItsMethod() throws IOException {
        String source = Files.readString(API_SERVER_SOURCE, StandardCharsets.UTF_8);
        String document = Files.readString(OPENAPI_DOCUMENT, StandardCharsets.UTF_8);
        Set<Route> registered = registeredRoutes(source);
        // guard against a parser that silently finds nothing: these routes exist since the first API commit
        assertTrue(registered.contains(new Route("get", "/health")), "no GET /health found in ApiServer.java: " + registered);
        assertTrue(registered.contains(new Route("post", "/v1/tokens")), "no POST /v1/tokens found in ApiServer.java: " + registered);
        assertEquals(Set.of(), undocumented(source, document),
                "routes registered in ApiServer.java but missing from the paths of openapi.yaml");
    }

    @Test
    void documentDeclaresOpenApi310() throws IOException {
        String document = Files.readString(OPENAPI_DOCUMENT, StandardCharsets.UTF_8);
        assertTrue(document.startsWith("openapi: 3.1.0\n"), "openapi.yaml must start with 'openapi: 3.1.0'");
    }

    @Test
    void aRouteMissingFromTheDocumentIsReported() {
        String source = """
                config.routes.get("/v1/things", things::list);
                config.routes.post("/v1/things/{thing}/parts", things::add);
                config.routes.delete("/v1/things/<thing>", things::remove);
                config.routes.before(auth::check);
                """;
        String document = """
                openapi: 3.1.0
                paths:
                  /v1/things:
                    get:
                      summary: listed
                  /v1/things/{thing}/parts:
                    get:
                      summary: documented with the wrong method
                x-outside-paths:
                  /v1/things/{thing}:
                    delete:
                      summary: not under paths, so not documented
                """;
        assertEquals(Set.of(new Route("post", "/v1/things/{thing}/parts"), new Route("delete", "/v1/things/{thing}")),
                undocumented(source, document));
    }

    @Test
    void quotedPathKeysAndBlankLinesAreRead() {
        String document = """
                paths:

                  '/v1/a/{x}':
                    parameters: []

                    put:
                      summary: x
                """;
        assertEquals(Set.of(new Route("put", "/v1/a/{x}")), documentedRoutes(document));
    }
}
