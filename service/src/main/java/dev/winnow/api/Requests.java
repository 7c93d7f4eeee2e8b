package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;

/** Reading and checking request parameters in one place, each failure a 400 that says what to send instead. */
public final class Requests {
    private Requests() {
    }

    /**
     * Before every route: a query string with a broken percent escape (a % not followed by two hex digits) is a 400,
     * rather than the parameter being silently dropped.
     */
    public static void checkQueryEscapes(Context ctx) {
        String query = ctx.queryString();
        if (query == null) {
            return;
        }
        for (int i = query.indexOf('%'); i >= 0; i = query.indexOf('%', i + 1)) {
            if (!isHex(query, i + 1) || !isHex(query, i + 2)) {
                String shown = query.substring(i, Math.min(query.length(), i + 3));
                throw ApiProblem.badRequest("The query string has a broken percent escape '" + shown + "': write % as %25, "
                        + "and every other escape as % followed by two hex digits.");
            }
        }
    }

    private static boolean isHex(String s, int at) {
        return at < s.length() && Character.digit(s.charAt(at), 16) >= 0;
    }

    public static void allowOnly(JsonNode body, Set<String> allowed) {
        List<String> unknown = new ArrayList<>();
        Iterator<String> names = body.fieldNames();
        while (names.hasNext()) {
            String n = names.next();
            if (!allowed.contains(n)) {
                unknown.add(n);
            }
        }
        if (!unknown.isEmpty()) {
            throw ApiProblem.badRequest("Unknown field(s) " + unknown + "; allowed fields are " + new TreeSet<>(allowed) + ".");
        }
    }

    public static String requiredText(JsonNode body, String field) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            throw ApiProblem.badRequest("Field '" + field + "' is required.");
        }
        if (!node.isTextual() || node.asText().isBlank()) {
            throw ApiProblem.badRequest("Field '" + field + "' must be a non-empty string.");
        }
        return node.asText();
    }

    /** A body field holding a date yyyy-mm-dd; null when absent or null. */
    public static LocalDate dateField(JsonNode body, String field) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            return null;
        }
        try {
            return LocalDate.parse(node.asText());
        } catch (DateTimeParseException e) {
            throw ApiProblem.badRequest("Field '" + field + "' must be a date yyyy-mm-dd, got " + node + ".");
        }
    }

    /** A body field holding a whole number from min to max; null when absent or null. */
    public static Integer intField(JsonNode body, String field, int min, int max) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isIntegralNumber() || !node.canConvertToInt() || node.asInt() < min || node.asInt() > max) {
            throw ApiProblem.badRequest("Field '" + field + "' must be a whole number from " + min + " to " + max + ", got " + node + ".");
        }
        return node.asInt();
    }

    public static LocalDate dateParam(Context ctx, String name) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return null;
        }
        try {
            return LocalDate.parse(text.trim());
        } catch (DateTimeParseException e) {
            throw ApiProblem.badRequest("Query parameter '" + name + "' must be a date yyyy-mm-dd, got '" + text + "'.");
        }
    }

    public static Integer intParam(Context ctx, String name, int min, int max) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return null;
        }
        int value;
        try {
            value = Integer.parseInt(text.trim());
        } catch (NumberFormatException e) {
            throw ApiProblem.badRequest("Query parameter '" + name + "' must be a whole number from " + min + " to " + max + ", got '" + text + "'.");
        }
        if (value < min || value > max) {
            throw ApiProblem.badRequest("Query parameter '" + name + "' must be from " + min + " to " + max + ", got " + value + ".");
        }
        return value;
    }

    public static Double doubleParam(Context ctx, String name) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return null;
        }
        try {
            double v = Double.parseDouble(text.trim());
            if (Double.isFinite(v)) {
                return v;
            }
        } catch (NumberFormatException e) {
            // fall through to the problem below
        }
        throw ApiProblem.badRequest("Query parameter '" + name + "' must be a finite number, got '" + text + "'.");
    }

    public static boolean booleanParam(Context ctx, String name) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return false;
        }
        return switch (text.trim()) {
            case "true" -> true;
            case "false" -> false;
            default -> throw ApiProblem.badRequest("Query parameter '" + name + "' must be true or false, got '" + text + "'.");
        };
    }

    /** One of the allowed words, or the default when absent. */
    public static String choiceParam(Context ctx, String name, List<String> allowed, String defaultValue) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return defaultValue;
        }
        if (!allowed.contains(text.trim())) {
            throw ApiProblem.badRequest("Query parameter '" + name + "' must be one of " + allowed + ", got '" + text + "'.");
        }
        return text.trim();
    }

    /** A comma-separated list, empty items removed; null when absent. */
    public static List<String> listParam(Context ctx, String name) {
        String text = ctx.queryParam(name);
        if (text == null || text.isBlank()) {
            return null;
        }
        List<String> items = new ArrayList<>();
        for (String part : text.split(",")) {
            if (!part.isBlank()) {
                items.add(part.trim());
            }
        }
        return items;
    }

    /** Answers 400 when any of the named query parameters is given: they do not apply to {@code what}. */
    public static void rejectParams(Context ctx, String what, String... names) {
        for (String name : names) {
            if (ctx.queryParam(name) != null) {
                throw ApiProblem.badRequest("Query parameter '" + name + "' does not apply to " + what + "; leave it out.");
            }
        }
    }

    public static void checkRange(LocalDate from, LocalDate to) {
        if (from != null && to != null && from.isAfter(to)) {
            throw ApiProblem.badRequest("'from' (" + from + ") is after 'to' (" + to + "); swap them.");
        }
    }
}
