package dev.winnow.api;

import com.fasterxml.jackson.core.io.NumberOutput;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.HexFormat;
import java.util.Locale;

/** CSV bodies, JSON bodies written ahead, and conditional GETs. */
final class Responses {
    private Responses() {
    }

    static boolean wantsCsv(Context ctx) {
        String format = ctx.queryParam("format");
        if (format != null && !format.isBlank()) {
            return switch (format.trim().toLowerCase(Locale.ROOT)) {
                case "csv" -> true;
                case "json" -> false;
                default -> throw ApiProblem.badRequest("Query parameter 'format' must be json or csv, got '" + format + "'.");
            };
        }
        String accept = ctx.header("Accept");
        return accept != null && accept.toLowerCase(Locale.ROOT).contains("text/csv") && !accept.toLowerCase(Locale.ROOT).contains("application/json");
    }

    /**
     * Sets an ETag from the version's data version and the request's query and format; answers 304 when the client
     * already holds it. The ETag changes whenever the series is rebuilt, extended or revised.
     */
    static boolean notModified(Context ctx, FactorVersionRecord v, boolean csv) {
        return tagged(ctx, v.factorId() + "." + v.version() + "." + v.dataVersion(), csv);
    }

    /**
     * The same for a response computed from several series: {@code dataKey} names every input version and its data
     * version, so that the ETag changes when any of them changes.
     */
    static boolean notModified(Context ctx, String dataKey, boolean csv) {
        return tagged(ctx, shortHash(dataKey), csv);
    }

    private static boolean tagged(Context ctx, String data, boolean csv) {
        String query = ctx.queryString() == null ? "" : ctx.queryString();
        String tag = "\"" + data + "." + shortHash(ctx.path() + "?" + query + (csv ? "#csv" : "#json")) + "\"";
        ctx.header("ETag", tag);
        String ifNoneMatch = ctx.header("If-None-Match");
        if (ifNoneMatch != null) {
            for (String candidate : ifNoneMatch.split(",")) {
                String c = candidate.trim();
                if (c.startsWith("W/")) {
                    c = c.substring(2);
                }
                if (c.equals(tag) || c.equals("*")) {
                    ctx.status(304);
                    return true;
                }
            }
        }
        return false;
    }

    private static String shortHash(String text) {
        try {
            byte[] digest = java.security.MessageDigest.getInstance("SHA-256").digest(text.getBytes(StandardCharsets.UTF_8));
            return HexFormat.of().formatHex(digest, 0, 8);
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** A two-column CSV with full double precision (the shortest decimal that reads back to the same double). */
    static void csv(Context ctx, String header, LocalDate[] dates, double[] values) {
        StringBuilder sb = new StringBuilder(dates.length * 24 + 32);
        sb.append(header).append('\n');
        for (int i = 0; i < dates.length; i++) {
            sb.append(dates[i]).append(',');
            if (Double.isFinite(values[i])) {
                sb.append(values[i]);
            }
            sb.append('\n');
        }
        csv(ctx, sb.toString());
    }

    static void csv(Context ctx, String body) {
        ctx.status(200).contentType("text/csv; charset=utf-8").result(body);
    }

    /** A body already encoded as JSON (by a streaming writer, for large answers). */
    static void json(Context ctx, byte[] body) {
        ctx.status(200).contentType("application/json").result(body);
    }

    /** A CSV cell (RFC 4180): quoted when it holds a comma, a quote or a line break; empty for null. */
    static String csvText(String text) {
        if (text == null) {
            return "";
        }
        if (text.indexOf(',') < 0 && text.indexOf('"') < 0 && text.indexOf('\n') < 0 && text.indexOf('\r') < 0) {
            return text;
        }
        return '"' + text.replace("\"", "\"\"") + '"';
    }

    /** A CSV number as the shortest decimal that reads back to the same double; empty when undefined, as JSON writes null. */
    static String csvNumber(double v) {
        return Double.isFinite(v) ? NumberOutput.toString(v, true) : "";
    }
}
