package dev.winnow.api;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.module.SimpleModule;
import com.fasterxml.jackson.databind.ser.std.StdSerializer;
import com.fasterxml.jackson.databind.ser.std.ToStringSerializer;
import io.javalin.http.Context;

import java.io.IOException;
import java.time.LocalDate;
import java.time.OffsetDateTime;

/**
 * JSON on the wire. Non-finite numbers are written as null (an undefined statistic, never NaN in JSON);
 * dates as ISO 8601 text.
 */
public final class Json {
    public static final ObjectMapper MAPPER = createMapper();

    private Json() {
    }

    private static ObjectMapper createMapper() {
        SimpleModule module = new SimpleModule("winnow-wire");
        module.addSerializer(Double.class, new FiniteDoubleSerializer());
        module.addSerializer(double.class, new FiniteDoubleSerializer());
        module.addSerializer(double[].class, new FiniteDoubleArraySerializer());
        module.addSerializer(LocalDate.class, ToStringSerializer.instance);
        module.addSerializer(OffsetDateTime.class, new TimestampSerializer());
        return new ObjectMapper()
                .registerModule(module)
                .addMixIn(dev.winnow.stats.Summary.class, StatsWire.class)
                .addMixIn(dev.winnow.stats.PeriodStatistics.class, StatsWire.class)
                .addMixIn(dev.winnow.stats.Monotonicity.Bucket.class, StatsWire.class)
                .addMixIn(dev.winnow.stats.Monotonicity.Step.class, StatsWire.class)
                .addMixIn(dev.winnow.stats.LiveRecord.Side.class, StatsWire.class)
                .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
                .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
                .enable(com.fasterxml.jackson.core.JsonParser.Feature.STRICT_DUPLICATE_DETECTION);
    }

    /**
     * The wire names of the value records of {@code stats} that answers hold (Summary, PeriodStatistics, the
     * monotonicity buckets and steps, a live record's sides): snake_case, as every answer spells them (Jackson's
     * strategy would write {@code nwTStat} as {@code nw_tstat}, hence the one explicit name).
     */
    @com.fasterxml.jackson.databind.annotation.JsonNaming(com.fasterxml.jackson.databind.PropertyNamingStrategies.SnakeCaseStrategy.class)
    private interface StatsWire {
        @com.fasterxml.jackson.annotation.JsonProperty("nw_t_stat")
        double nwTStat();
    }

    public static void respond(Context ctx, int status, Object body) {
        ctx.status(status).contentType("application/json").result(bytes(body));
    }

    /** A value as UTF-8 JSON bytes. */
    public static byte[] bytes(Object body) {
        try {
            return MAPPER.writeValueAsBytes(body);
        } catch (IOException e) {
            throw new IllegalStateException("response could not be written as JSON", e);
        }
    }

    public static void respond(Context ctx, Object body) {
        respond(ctx, 200, body);
    }

    public static String write(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (IOException e) {
            throw new IllegalStateException("value could not be written as JSON", e);
        }
    }

    /** Parses a request body as a JSON object, or answers 400 saying what is wrong with it. */
    public static JsonNode readObject(Context ctx) {
        String type = ctx.contentType();
        if (type != null && !isJson(type)) {
            throw new ApiProblem(415, "Unsupported media type", "Send the body as 'Content-Type: application/json'; got '"
                    + type + "'.");
        }
        byte[] body = ctx.bodyAsBytes();
        if (body.length == 0) {
            throw ApiProblem.badRequest("The request body is empty; send a JSON object.");
        }
        JsonNode node;
        try {
            node = MAPPER.readTree(body);
        } catch (IOException e) {
            throw ApiProblem.badRequest("The request body is not valid JSON: " + firstLine(e.getMessage()));
        }
        if (node == null || !node.isObject()) {
            throw ApiProblem.badRequest("The request body must be a JSON object.");
        }
        return node;
    }

    /** application/json or a +json type, parameters aside. */
    static boolean isJson(String contentType) {
        String media = mediaType(contentType);
        return media.equals("application/json") || (media.startsWith("application/") && media.endsWith("+json"));
    }

    /** The media type of a Content-Type header in lower case, without parameters. */
    static String mediaType(String contentType) {
        int semicolon = contentType.indexOf(';');
        return (semicolon < 0 ? contentType : contentType.substring(0, semicolon)).trim().toLowerCase(java.util.Locale.ROOT);
    }

    private static String firstLine(String message) {
        if (message == null) {
            return "unreadable";
        }
        int nl = message.indexOf('\n');
        return nl < 0 ? message : message.substring(0, nl);
    }

    private static final class FiniteDoubleSerializer extends StdSerializer<Double> {
        FiniteDoubleSerializer() {
            super(Double.class);
        }

        @Override
        public void serialize(Double value, JsonGenerator gen, SerializerProvider provider) throws IOException {
            if (value == null || !Double.isFinite(value)) {
                gen.writeNull();
            } else {
                gen.writeNumber(value);
            }
        }
    }

    private static final class FiniteDoubleArraySerializer extends StdSerializer<double[]> {
        FiniteDoubleArraySerializer() {
            super(double[].class);
        }

        @Override
        public void serialize(double[] values, JsonGenerator gen, SerializerProvider provider) throws IOException {
            gen.writeStartArray(values, values.length);
            for (double v : values) {
                if (Double.isFinite(v)) {
                    gen.writeNumber(v);
                } else {
                    gen.writeNull();
                }
            }
            gen.writeEndArray();
        }
    }

    /** RFC 3339 timestamps in UTC with milliseconds, e.g. 2026-12-01T21:30:00.000Z. */
    private static final class TimestampSerializer extends StdSerializer<OffsetDateTime> {
        private static final java.time.format.DateTimeFormatter FORMAT =
                java.time.format.DateTimeFormatter.ofPattern("yyyy-MM-dd'T'HH:mm:ss.SSSXXX");

        TimestampSerializer() {
            super(OffsetDateTime.class);
        }

        @Override
        public void serialize(OffsetDateTime value, JsonGenerator gen, SerializerProvider provider) throws IOException {
            gen.writeString(FORMAT.format(value.withOffsetSameInstant(java.time.ZoneOffset.UTC)));
        }
    }
}
