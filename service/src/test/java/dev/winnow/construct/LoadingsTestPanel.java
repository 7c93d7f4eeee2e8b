package dev.winnow.construct;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/** A panel held in memory for tests: rows added per (date, security id), returns only. */
public final class LoadingsTestPanel implements PanelSource {
    private final List<LocalDate> dates;
    private final List<CrossSection> slices;

    private LoadingsTestPanel(List<LocalDate> dates, List<CrossSection> slices) {
        this.dates = dates;
        this.slices = slices;
    }

    @Override
    public List<LocalDate> dates() {
        return dates;
    }

    @Override
    public CrossSection crossSection(int index) {
        return slices.get(index);
    }

    /** Reads a committed fixture from the test classpath ({@code /fixtures/...}). */
    public static String fixture(String name) {
        try (InputStream in = LoadingsTestPanel.class.getResourceAsStream("/fixtures/" + name)) {
            if (in == null) {
                throw new IllegalStateException("missing fixture " + name);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A panel of ready-made cross-sections, one per date. */
    public static LoadingsTestPanel of(List<LocalDate> dates, List<CrossSection> slices) {
        return new LoadingsTestPanel(List.copyOf(dates), List.copyOf(slices));
    }

    public static Builder builder(List<LocalDate> dates) {
        return new Builder(dates);
    }

    public static final class Builder {
        private final List<LocalDate> dates;
        private final List<TreeMap<Integer, Double>> rows = new ArrayList<>();

        Builder(List<LocalDate> dates) {
            this.dates = List.copyOf(dates);
            dates.forEach(d -> rows.add(new TreeMap<>()));
        }

        /** A row of security {@code id} at grid index {@code t}; NaN for a row without a return. */
        public Builder row(int t, int id, double ret) {
            rows.get(t).put(id, ret);
            return this;
        }

        public LoadingsTestPanel build() {
            List<CrossSection> slices = new ArrayList<>();
            for (int t = 0; t < dates.size(); t++) {
                TreeMap<Integer, Double> r = rows.get(t);
                int[] ids = r.keySet().stream().mapToInt(Integer::intValue).toArray();
                double[] returns = r.values().stream().mapToDouble(Double::doubleValue).toArray();
                double[] caps = new double[ids.length];
                Arrays.fill(caps, Double.NaN);
                slices.add(new CrossSection(dates.get(t), ids, returns, caps, Map.of(), Map.of()));
            }
            return new LoadingsTestPanel(dates, slices);
        }
    }
}
