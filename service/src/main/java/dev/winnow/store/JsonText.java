package dev.winnow.store;

import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.module.SimpleModule;
import com.fasterxml.jackson.databind.ser.std.ToStringSerializer;

import java.io.IOException;
import java.time.LocalDate;
import java.util.Map;

/** JSON text for job parameters and reports kept in the store. */
public final class JsonText {
    private static final ObjectMapper MAPPER = new ObjectMapper().registerModule(new SimpleModule("dates")
            .addSerializer(LocalDate.class, ToStringSerializer.instance));

    private JsonText() {
    }

    public static String write(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (IOException e) {
            throw new IllegalStateException("could not write JSON", e);
        }
    }

    public static Map<String, Object> readMap(String json) {
        try {
            return MAPPER.readValue(json, new TypeReference<>() { });
        } catch (IOException e) {
            throw new IllegalStateException("stored JSON is unreadable: " + json, e);
        }
    }

    public static java.util.List<Map<String, Object>> readList(String json) {
        try {
            return MAPPER.readValue(json, new TypeReference<>() { });
        } catch (IOException e) {
            throw new IllegalStateException("stored JSON is unreadable: " + json, e);
        }
    }
}
