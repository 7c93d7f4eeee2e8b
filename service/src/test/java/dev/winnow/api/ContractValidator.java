package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.fasterxml.jackson.databind.node.TextNode;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import com.networknt.schema.Error;
import com.networknt.schema.Schema;
import com.networknt.schema.SchemaRegistry;
import com.networknt.schema.SpecificationVersion;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URI;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Checks an HTTP answer against openapi.yaml: the path and method are an operation of the document, the status is
 * listed for it (exactly, as a range such as {@code 4XX}, or as {@code default}), the content type is one the response
 * lists (or there is no body where it lists none), and a JSON body validates against the response's schema. OpenAPI
 * 3.1 schemas are JSON Schema 2020-12, validated here by networknt's json-schema-validator. A path the document does
 * not have must answer 404 and a method a documented path does not have 405, both as a {@code Problem}.
 *
 * <p>{@link #openObjectSchemas()} lists every object schema of the document that leaves {@code additionalProperties}
 * unsaid; the code answers fixed sets of fields, so the document must say so ({@code false}) or say what the extra
 * members are (a schema, as for maps keyed by factor name).
 */
public final class ContractValidator {
    /** Surefire runs in the module directory (service/). */
    private static final Path DOCUMENT = Path.of("../openapi.yaml");
    private static final String BASE = "https://contract.winnow.invalid/openapi.json";
    private static final ObjectMapper JSON = new ObjectMapper();
    private static volatile ContractValidator shared;

    private final JsonNode document;
    private final SchemaRegistry registry;
    private final Map<String, Schema> schemas = new ConcurrentHashMap<>();

    private ContractValidator(JsonNode document) {
        this.document = document;
        String text = document.toString();
        this.registry = SchemaRegistry.withDefaultDialect(SpecificationVersion.DRAFT_2020_12,
                builder -> builder.schemas(Map.of(BASE, text)));
    }

    /** The validator of the repository's openapi.yaml, read once. */
    public static ContractValidator shared() {
        ContractValidator v = shared;
        if (v == null) {
            synchronized (ContractValidator.class) {
                if (shared == null) {
                    shared = of(read(DOCUMENT));
                }
                v = shared;
            }
        }
        return v;
    }

    static ContractValidator of(JsonNode document) {
        return new ContractValidator(document);
    }

    static JsonNode read(Path yaml) {
        try {
            return new ObjectMapper(new YAMLFactory()).readTree(Files.readString(yaml));
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + yaml, e);
        }
    }

    static JsonNode readYaml(String yaml) {
        try {
            return new ObjectMapper(new YAMLFactory()).readTree(yaml);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Every way the answer departs from the document, empty when it conforms.
     *
     * @param contentType the answer's Content-Type header, or null
     */
    public List<String> problems(String method, URI uri, int status, String contentType, String body) {
        String path = uri.getRawPath();
        String template = template(path);
        List<String> out = new ArrayList<>();
        if (template == null) {
            if (status != 404) {
                out.add("path " + path + " is not in openapi.yaml, yet it answered " + status + " (only 404 is allowed)");
                return out;
            }
            checkProblem(status, contentType, body, out);
            return out;
        }
        JsonNode operation = document.path("paths").path(template).get(method.toLowerCase(Locale.ROOT));
        if (operation == null) {
            if (status != 405) {
                out.add(method + " " + template + " is not in openapi.yaml, yet it answered " + status + " (only 405 is allowed)");
                return out;
            }
            checkProblem(status, contentType, body, out);
            return out;
        }
        String where = method.toUpperCase(Locale.ROOT) + " " + template + " answered " + status;
        JsonNode responses = operation.path("responses");
        String code = String.valueOf(status);
        String key = responses.has(code) ? code : responses.has(code.charAt(0) + "XX") ? code.charAt(0) + "XX"
                : responses.has("default") ? "default" : null;
        if (key == null) {
            out.add(where + ", a status openapi.yaml does not list for it (listed: " + fieldNames(responses) + ")");
            return out;
        }
        JsonNode response = resolve(responses.get(key));
        JsonNode content = response.get("content");
        boolean hasBody = body != null && !body.isEmpty();
        if (content == null || content.isEmpty()) {
            if (hasBody) {
                out.add(where + " with a body, where openapi.yaml describes none: " + abbreviate(body));
            }
            return out;
        }
        String mediaType = contentType == null ? null : contentType.split(";", 2)[0].trim().toLowerCase(Locale.ROOT);
        if (mediaType == null || !content.has(mediaType)) {
            out.add(where + " as " + contentType + ", not a content type openapi.yaml lists for it (" + fieldNames(content) + ")");
            return out;
        }
        if (isJson(mediaType)) {
            JsonNode schema = content.path(mediaType).get("schema");
            if (schema != null) {
                validate(where, schema, body, out);
            }
        }
        return out;
    }

    /** Throws an AssertionError naming every problem of the answer. */
    public void check(String method, URI uri, int status, String contentType, String body) {
        List<String> problems = problems(method, uri, status, contentType, body);
        if (!problems.isEmpty()) {
            throw new AssertionError("the answer to " + method + " " + uri.getRawPath()
                    + (uri.getRawQuery() == null ? "" : "?" + uri.getRawQuery()) + " departs from openapi.yaml:\n  - "
                    + String.join("\n  - ", problems) + "\n  body: " + abbreviate(body));
        }
    }

    /** JSON pointers of object schemas that leave additionalProperties (and unevaluatedProperties) unsaid. */
    public List<String> openObjectSchemas() {
        List<String> out = new ArrayList<>();
        walk(document.path("components").path("schemas"), "#/components/schemas", out);
        walk(document.path("components").path("responses"), "#/components/responses", out);
        walk(document.path("paths"), "#/paths", out);
        return out;
    }

    /**
     * A schema with {@code properties} must close itself, except a branch of an {@code allOf} whose schema closes
     * the whole with {@code unevaluatedProperties} (which sees through allOf), and a component marked
     * {@code x-base: true}, a set of fields other schemas extend, which must then be closed wherever it is used.
     */
    private void walk(JsonNode node, String pointer, List<String> out) {
        walk(node, pointer, false, out);
    }

    private void walk(JsonNode node, String pointer, boolean closedByParent, List<String> out) {
        if (node.isObject()) {
            boolean schemaLike = node.has("properties") && node.get("properties").isObject();
            boolean closed = node.has("additionalProperties") || node.has("unevaluatedProperties");
            if (schemaLike && !closed && !closedByParent && !node.path("x-base").asBoolean(false)) {
                out.add(pointer);
            }
            JsonNode ref = node.get("$ref");
            if (ref != null && !closedByParent && !closed && resolveOrNull(ref.asText()) != null
                    && resolveOrNull(ref.asText()).path("x-base").asBoolean(false)) {
                out.add(pointer + " (uses the base " + ref.asText() + " without closing it)");
            }
            for (Iterator<Map.Entry<String, JsonNode>> it = node.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                String child = pointer + "/" + e.getKey().replace("~", "~0").replace("/", "~1");
                if (e.getKey().equals("allOf") && e.getValue().isArray()) {
                    boolean closes = node.has("unevaluatedProperties") || closedByParent;
                    for (int i = 0; i < e.getValue().size(); i++) {
                        walk(e.getValue().get(i), child + "/" + i, closes, out);
                    }
                } else {
                    walk(e.getValue(), child, false, out);
                }
            }
        } else if (node.isArray()) {
            for (int i = 0; i < node.size(); i++) {
                walk(node.get(i), pointer + "/" + i, false, out);
            }
        }
    }

    private JsonNode resolveOrNull(String ref) {
        if (!ref.startsWith("#/")) {
            return null;
        }
        JsonNode target = document.at(ref.substring(1));
        return target.isMissingNode() ? null : target;
    }

    private void checkProblem(int status, String contentType, String body, List<String> out) {
        String where = "the " + status + " answer";
        if (contentType == null || !contentType.startsWith("application/problem+json")) {
            out.add(where + " is " + contentType + ", not application/problem+json");
            return;
        }
        validate(where, JSON.createObjectNode().put("$ref", "#/components/schemas/Problem"), body, out);
    }

    private void validate(String where, JsonNode schemaNode, String body, List<String> out) {
        JsonNode instance;
        try {
            instance = JSON.readTree(body == null ? "" : body);
        } catch (IOException e) {
            out.add(where + " with a body that is not JSON: " + abbreviate(body));
            return;
        }
        if (instance == null || instance.isMissingNode()) {
            out.add(where + " with an empty body where openapi.yaml describes JSON");
            return;
        }
        Schema schema = schemas.computeIfAbsent(schemaNode.toString(), k -> registry.getSchema(absolute(schemaNode)));
        for (Error error : schema.validate(instance)) {
            out.add(where + ": " + error.getInstanceLocation() + " " + error.getMessage());
        }
    }

    /** A copy of a schema of the document whose local references point into the document. */
    private static JsonNode absolute(JsonNode node) {
        JsonNode copy = node.deepCopy();
        rewrite(copy);
        return copy;
    }

    private static void rewrite(JsonNode node) {
        if (node instanceof ObjectNode object) {
            JsonNode ref = object.get("$ref");
            if (ref != null && ref.isTextual() && ref.asText().startsWith("#")) {
                object.set("$ref", TextNode.valueOf(BASE + ref.asText()));
            }
            object.forEach(ContractValidator::rewrite);
        } else if (node.isArray()) {
            node.forEach(ContractValidator::rewrite);
        }
    }

    private JsonNode resolve(JsonNode node) {
        JsonNode current = node;
        for (int hops = 0; current.has("$ref") && hops < 10; hops++) {
            String ref = current.get("$ref").asText();
            if (!ref.startsWith("#/")) {
                throw new IllegalStateException("only local references are supported: " + ref);
            }
            current = document.at(ref.substring(1));
        }
        return current;
    }

    /** The documented path template a request path matches, preferring literal segments; null when none. */
    String template(String path) {
        String[] segments = path.split("/", -1);
        String best = null;
        int bestLiterals = -1;
        for (Iterator<String> it = document.path("paths").fieldNames(); it.hasNext(); ) {
            String candidate = it.next();
            String[] parts = candidate.split("/", -1);
            if (parts.length != segments.length) {
                continue;
            }
            int literals = 0;
            boolean matches = true;
            for (int i = 0; i < parts.length && matches; i++) {
                if (parts[i].startsWith("{") && parts[i].endsWith("}")) {
                    matches = !segments[i].isEmpty();
                } else {
                    matches = parts[i].equals(segments[i]);
                    literals++;
                }
            }
            if (matches && literals > bestLiterals) {
                best = candidate;
                bestLiterals = literals;
            }
        }
        return best;
    }

    private static boolean isJson(String mediaType) {
        return mediaType.equals("application/json") || mediaType.endsWith("+json");
    }

    private static String fieldNames(JsonNode node) {
        List<String> names = new ArrayList<>();
        node.fieldNames().forEachRemaining(names::add);
        return String.join(", ", names);
    }

    private static String abbreviate(String body) {
        if (body == null) {
            return "(none)";
        }
        return body.length() <= 600 ? body : body.substring(0, 600) + "...";
    }
}
