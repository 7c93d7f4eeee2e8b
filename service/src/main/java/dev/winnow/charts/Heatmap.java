package dev.winnow.charts;

import java.util.List;
import java.util.Locale;

/**
 * A correlation matrix as a grid of cells, each filled by {@link Palette#diverging} and with its coefficient written
 * in it to two decimals (so the value never depends on reading a colour). Each cell is a {@code rect} with
 * {@code data-row}, {@code data-col} and the full-precision {@code data-value}; an undefined coefficient (NaN) is a
 * grey cell written "n/a".
 */
public record Heatmap(List<String> names, double[][] matrix, String valueLabel) {

    public Heatmap {
        names = List.copyOf(names);
        if (matrix.length != names.size()) {
            throw new IllegalArgumentException("matrix has " + matrix.length + " rows for " + names.size() + " names");
        }
        for (double[] row : matrix) {
            if (row.length != names.size()) {
                throw new IllegalArgumentException("matrix is not square");
            }
        }
    }

    /** The coefficient as written in its cell: two decimals, a true minus sign; "n/a" when undefined. */
    public static String cellText(double v) {
        if (!Double.isFinite(v)) {
            return "n/a";
        }
        String s = String.format(Locale.ROOT, "%.2f", v);
        if (s.equals("-0.00")) {
            s = "0.00";
        }
        return s.replace('-', '\u2212');
    }

    public String render(ChartFrame frame) {
        int n = names.size();
        int longest = names.stream().mapToInt(String::length).max().orElse(1);
        double labelSpace = Math.min(200, 7.0 * longest + 12);
        double left = 16 + labelSpace;
        double top = 40 + labelSpace * 0.72;
        double legendSpace = 70;
        double cell = Math.max(4, Math.min((frame.width() - left - legendSpace - 16) / n, (frame.height() - top - 16) / n));
        double fontSize = Math.max(7, Math.min(13, cell / 3.4));

        Svg svg = frame.begin("heatmap");
        svg.open("g", "id", "plot", "data-plot", Svg.num(left) + " " + Svg.num(top) + " " + Svg.num(cell * n) + " " + Svg.num(cell * n))
                .newline();
        for (int i = 0; i < n; i++) {
            double y = top + i * cell + cell / 2 + 4;
            svg.text("text", names.get(i), "class", "row-label", "x", left - 6, "y", y, "text-anchor", "end", "fill", Palette.BLACK).newline();
            double x = left + i * cell + cell / 2;
            svg.text("text", names.get(i), "class", "col-label", "transform", "translate(" + Svg.num(x) + " " + Svg.num(top - 6) + ") rotate(-45)",
                    "text-anchor", "start", "fill", Palette.BLACK).newline();
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double v = matrix[i][j];
                String fill = Double.isFinite(v) ? Palette.diverging(v) : "#BFBFBF";
                double x = left + j * cell;
                double y = top + i * cell;
                svg.open("rect", "class", "cell", "data-row", names.get(i), "data-col", names.get(j),
                        "data-value", Double.isFinite(v) ? String.valueOf(v) : "NaN", "x", x, "y", y, "width", cell, "height", cell,
                        "fill", fill, "stroke", "#FFFFFF", "stroke-width", "1");
                svg.text("title", names.get(i) + " and " + names.get(j) + ": " + cellText(v)).close("rect");
                if (cell >= 18) {
                    svg.text("text", cellText(v), "class", "cell-text", "x", x + cell / 2, "y", y + cell / 2 + fontSize * 0.35,
                            "text-anchor", "middle", "font-size", Svg.num(fontSize), "fill", Palette.textOn(fill), "aria-hidden", "true");
                }
                svg.newline();
            }
        }
        svg.close("g").newline();

        // colour key: -1 to 1 in steps of 0.25, top to bottom from +1
        double keyX = left + cell * n + 24;
        double keyH = Math.min(cell * n, 240);
        double step = keyH / 9;
        svg.open("g", "class", "legend").newline();
        svg.text("text", valueLabel, "x", keyX, "y", top - 10, "fill", Palette.BLACK).newline();
        for (int k = 0; k < 9; k++) {
            double v = 1.0 - k * 0.25;
            svg.empty("rect", "x", keyX, "y", top + k * step, "width", 16, "height", step, "fill", Palette.diverging(v));
            svg.text("text", cellText(v), "x", keyX + 22, "y", top + k * step + step / 2 + 4, "fill", Palette.BLACK).newline();
        }
        svg.close("g").newline();
        return svg.close("svg").newline().toString();
    }
}
