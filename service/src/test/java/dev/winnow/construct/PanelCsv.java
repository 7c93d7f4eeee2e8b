package dev.winnow.construct;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * Test-only reader of the long-format panel fixture {@code date,security,return,market_cap,<numbers...>,<labels...>}
 * into cross-sections. Empty cells are missing (NaN / null).
 */
final class PanelCsv {
    private PanelCsv() {
    }

    static List<String[]> readRows(String resource) {
        InputStream in = PanelCsv.class.getResourceAsStream(resource);
        if (in == null) {
            throw new IllegalStateException("missing test resource " + resource);
        }
        try (BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
            List<String[]> rows = new ArrayList<>();
            for (String line = reader.readLine(); line != null; line = reader.readLine()) {
                if (!line.isEmpty()) {
                    rows.add(line.split(",", -1));
                }
            }
            return rows;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static double number(String cell) {
        return cell.isEmpty() ? Double.NaN : Double.parseDouble(cell);
    }

    static InMemoryPanel read(String resource, List<String> numberColumns, List<String> labelColumns) {
        List<String[]> rows = readRows(resource);
        List<String> header = List.of(rows.get(0));
        Map<LocalDate, TreeMap<Integer, String[]>> byDate = new TreeMap<>();
        for (String[] row : rows.subList(1, rows.size())) {
            byDate.computeIfAbsent(LocalDate.parse(row[0]), d -> new TreeMap<>()).put(Integer.parseInt(row[1]), row);
        }
        List<CrossSection> sections = new ArrayList<>();
        byDate.forEach((date, securities) -> {
            int n = securities.size();
            int[] ids = new int[n];
            double[] returns = new double[n];
            double[] caps = new double[n];
            Map<String, double[]> numbers = new HashMap<>();
            Map<String, String[]> labels = new HashMap<>();
            numberColumns.forEach(c -> numbers.put(c, new double[n]));
            labelColumns.forEach(c -> labels.put(c, new String[n]));
            int i = 0;
            for (Map.Entry<Integer, String[]> e : securities.entrySet()) {
                String[] row = e.getValue();
                ids[i] = e.getKey();
                returns[i] = number(row[header.indexOf("return")]);
                caps[i] = number(row[header.indexOf("market_cap")]);
                for (String c : numberColumns) {
                    numbers.get(c)[i] = number(row[header.indexOf(c)]);
                }
                for (String c : labelColumns) {
                    String cell = row[header.indexOf(c)];
                    labels.get(c)[i] = cell.isEmpty() ? null : cell;
                }
                i++;
            }
            sections.add(new CrossSection(date, ids, returns, caps, numbers, labels));
        });
        return new InMemoryPanel(sections);
    }
}
