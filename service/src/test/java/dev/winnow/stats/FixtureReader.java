package dev.winnow.stats;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/** Reads committed fixtures from the test classpath ({@code /fixtures/...}); JSON null and empty CSV cells mean NaN. */
final class FixtureReader {

    private FixtureReader() {
    }

    static String text(String name) {
        try (InputStream in = FixtureReader.class.getResourceAsStream("/fixtures/" + name)) {
            if (in == null) {
                throw new IllegalStateException("missing fixture " + name);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static JsonNode json(String name) {
        try {
            return new ObjectMapper().readTree(text(name));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static double[] doubles(JsonNode array) {
        double[] values = new double[array.size()];
        for (int i = 0; i < values.length; i++) {
            values[i] = array.get(i).isNull() ? Double.NaN : array.get(i).asDouble();
        }
        return values;
    }

    static double[][] matrix(JsonNode rows) {
        double[][] values = new double[rows.size()][];
        for (int i = 0; i < values.length; i++) {
            values[i] = doubles(rows.get(i));
        }
        return values;
    }

    static int[] ints(JsonNode array) {
        int[] values = new int[array.size()];
        for (int i = 0; i < values.length; i++) {
            values[i] = array.get(i).asInt();
        }
        return values;
    }

    /** CSV with a header row; returns the data rows as doubles. */
    static List<double[]> csvRows(String name) {
        List<String> lines = Arrays.stream(text(name).split("\n")).filter(l -> !l.isBlank()).toList();
        List<double[]> rows = new ArrayList<>();
        for (String line : lines.subList(1, lines.size())) {
            String[] cells = line.trim().split(",", -1);
            double[] row = new double[cells.length];
            for (int i = 0; i < cells.length; i++) {
                row[i] = cells[i].isEmpty() ? Double.NaN : Double.parseDouble(cells[i]);
            }
            rows.add(row);
        }
        return rows;
    }
}
