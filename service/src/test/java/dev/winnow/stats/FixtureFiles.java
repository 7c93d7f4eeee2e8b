package dev.winnow.stats;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.time.LocalDate;

/** Reads the committed reference fixtures under src/test/resources/fixtures (written by src/test/scripts). */
final class FixtureFiles {

    private FixtureFiles() {
    }

    static JsonNode read(String name) {
        try (InputStream in = FixtureFiles.class.getResourceAsStream("/fixtures/" + name)) {
            if (in == null) {
                throw new IllegalStateException("missing fixture " + name);
            }
            return new ObjectMapper().readTree(in);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static double[] doubles(JsonNode array) {
        double[] values = new double[array.size()];
        for (int i = 0; i < values.length; i++) {
            values[i] = array.get(i).asDouble();
        }
        return values;
    }

    /** A number, or NaN where the fixture holds null (an undefined value). */
    static double numberOrNaN(JsonNode node) {
        return node == null || node.isNull() ? Double.NaN : node.asDouble();
    }

    static ReturnSeries series(JsonNode dates, JsonNode values) {
        LocalDate[] parsed = new LocalDate[dates.size()];
        for (int i = 0; i < parsed.length; i++) {
            parsed[i] = LocalDate.parse(dates.get(i).asText());
        }
        return new ReturnSeries(parsed, doubles(values));
    }
}
