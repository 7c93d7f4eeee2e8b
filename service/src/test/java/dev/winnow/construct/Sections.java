package dev.winnow.construct;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.Map;

/** Test helpers to write small cross-sections inline. */
final class Sections {
    private Sections() {
    }

    static CrossSection of(String date, int[] ids, double[] returns, double[] caps, double[] signal) {
        return new CrossSection(LocalDate.parse(date), ids, returns, caps, Map.of("signal", signal), Map.of());
    }

    static CrossSection withLabels(String date, int[] ids, double[] returns, double[] caps, double[] signal,
                                   String[] group) {
        return new CrossSection(LocalDate.parse(date), ids, returns, caps, Map.of("signal", signal),
                Map.of("group", group));
    }

    static double[] nan(int n) {
        double[] values = new double[n];
        Arrays.fill(values, Double.NaN);
        return values;
    }
}
