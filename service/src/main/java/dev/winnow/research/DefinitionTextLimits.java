package dev.winnow.research;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.store.Limits;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;

/**
 * The lengths of a definition's text before it is read: {@code rationale} at most {@link Limits#MAX_RATIONALE_CHARS}
 * characters, every other text value and every field name at most {@link Limits#MAX_DEFINITION_TEXT_CHARS}, and the
 * whole canonical definition within what the store keeps ({@link Limits#MAX_DEFINITION_CHARS}).
 */
final class DefinitionTextLimits {
    private static final int MAX_PROBLEMS = 20;

    private DefinitionTextLimits() {
    }

    /** One sentence per text that is too long, each naming its path; empty when all fit. */
    static List<String> problems(JsonNode body) {
        List<String> problems = new ArrayList<>();
        walk(body, "", problems);
        return problems;
    }

    private static void walk(JsonNode node, String path, List<String> problems) {
        if (problems.size() >= MAX_PROBLEMS) {
            return;
        }
        if (node.isTextual()) {
            int limit = path.equals("rationale") ? Limits.MAX_RATIONALE_CHARS : Limits.MAX_DEFINITION_TEXT_CHARS;
            int length = node.textValue().length();
            if (length > limit) {
                problems.add(path + " is " + length + " characters long; at most " + limit + " are allowed");
            }
        } else if (node.isObject()) {
            Iterator<Map.Entry<String, JsonNode>> fields = node.fields();
            while (fields.hasNext()) {
                Map.Entry<String, JsonNode> field = fields.next();
                String name = field.getKey();
                if (name.length() > Limits.MAX_DEFINITION_TEXT_CHARS) {
                    problems.add("a field name at " + (path.isEmpty() ? "the top level" : path) + " is " + name.length()
                            + " characters long; at most " + Limits.MAX_DEFINITION_TEXT_CHARS + " are allowed");
                    continue;
                }
                walk(field.getValue(), path.isEmpty() ? name : path + "." + name, problems);
            }
        } else if (node.isArray()) {
            for (int i = 0; i < node.size(); i++) {
                walk(node.get(i), path + "[" + i + "]", problems);
            }
        }
    }
}
