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
    static final String CSV_TYPE = "text/csv; charset=utf-8";
    static final String JSON_TYPE = "application/json";
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
        return notModified(ctx, dataKey(v), csv);
    }

    /**
     * The same for a response computed from several series: {@code dataKey} names every input version and its data
     * version, so that the ETag changes when any of them changes.
     */
    static boolean notModified(Context ctx, String dataKey, boolean csv) {
        String tag = etag(dataKey, ctx, csv);
        ctx.header("ETag", tag);
        if (matches(ctx, tag)) {
            ctx.status(304);
            return true;
        }
        return false;
    }

    /** What a series answer depends on: the factor, the version and its data version (bumped by every change). */
    static String dataKey(FactorVersionRecord v) {
        return v.factorId() + "." + v.version() + "." + v.dataVersion();
    }

    /** The data key of an answer over several versions, in request order. */
    static String dataKey(java.util.List<FactorVersionRecord> versions) {
        StringBuilder key = new StringBuilder();
        for (FactorVersionRecord v : versions) {
            key.append(key.length() == 0 ? "" : ",").append(dataKey(v));
        }
        return key.toString();
    }

    /**
     * The ETag of an answer: its data key (hashed when long) and a hash of the path, query and format, so that it
     * changes whenever any input changes and differs between requests.
     */
    static String etag(String dataKey, Context ctx, boolean csv) {
        String query = ctx.queryString() == null ? "" : ctx.queryString();
        String data = dataKey.length() <= 32 && dataKey.indexOf(',') < 0 ? dataKey : shortHash(dataKey);
        return "\"" + data + "." + shortHash(ctx.path() + "?" + query + (csv ? "#csv" : "#json")) + "\"";
    }

    /** True when If-None-Match names {@code tag} (weak or strong) or is *. */
    static boolean matches(Context ctx, String tag) {
        String ifNoneMatch = ctx.header("If-None-Match");
        if (ifNoneMatch != null) {
            for (String candidate : ifNoneMatch.split(",")) {
                String c = candidate.trim();
                if (c.startsWith("W/")) {
                    c = c.substring(2);
                }
                if (c.equals(tag) || c.equals("*")) {
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
        csv(ctx, csvSeries(header, dates, values));
    }

    /** The two-column CSV as text. */
    static String csvSeries(String header, LocalDate[] dates, double[] values) {
        StringBuilder sb = new StringBuilder(dates.length * 24 + 32);
        sb.append(header).append('\n');
        for (int i = 0; i < dates.length; i++) {
            sb.append(dates[i]).append(',');
            if (Double.isFinite(values[i])) {
                sb.append(values[i]);
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    static ServedResponses.Encoded csvBody(String text) {
        return new ServedResponses.Encoded(text.getBytes(StandardCharsets.UTF_8), CSV_TYPE);
    }

    static ServedResponses.Encoded jsonBody(Object value) {
        return new ServedResponses.Encoded(Json.bytes(value), JSON_TYPE);
    }

    static void csv(Context ctx, String body) {
        ctx.status(200).contentType(CSV_TYPE).result(body);
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
