package dev.winnow.charts;

import java.util.List;

/**
 * Bars from zero, one per category (bucket portfolios, IC horizons), each with a note written above or below it
 * (for example its t-statistic), on a linear value axis that always includes zero. Each bar is a {@code rect} with
 * class {@code bar}, {@code data-category} and the full-precision {@code data-value}; the plot declares its scale
 * on {@code g#plot} ({@code data-plot}, {@code data-y-domain}) as time charts do. An undefined value draws no bar and
 * writes "n/a".
 */
public record BarChart(String xLabel, String yLabel, ValueAxis.Format format, List<Bar> bars, String colour) {

    /** One category: its label, value and the note written beside the bar. */
    public record Bar(String category, double value, String note) {
    }

    public BarChart {
        bars = List.copyOf(bars);
        if (bars.isEmpty()) {
            throw new IllegalArgumentException("a bar chart needs at least one bar");
        }
    }

    private static final int LEFT = 76;
    private static final int RIGHT = 24;
    private static final int TOP = 48;
    private static final int BOTTOM = 58;

    public String render(ChartFrame frame) {
        double plotX = LEFT;
        double plotY = TOP;
        double plotW = frame.width() - LEFT - RIGHT;
        double plotH = frame.height() - TOP - BOTTOM;
        double lo = 0;
        double hi = 0;
        for (Bar b : bars) {
            if (Double.isFinite(b.value())) {
                lo = Math.min(lo, b.value());
                hi = Math.max(hi, b.value());
            }
        }
        // room for the notes beyond the longest bars
        double pad = (hi - lo) * 0.12;
        ValueAxis axis = ValueAxis.linear(lo < 0 ? lo - pad : lo, hi > 0 ? hi + pad : hi, Math.max(3, (int) (plotH / 45)), format);
        java.util.function.DoubleUnaryOperator yOf = v -> axis.y(v, plotY, plotH);

        Svg svg = frame.begin("bars");
        svg.open("g", "id", "plot", "data-plot", Svg.num(plotX) + " " + Svg.num(plotY) + " " + Svg.num(plotW) + " " + Svg.num(plotH),
                "data-y-domain", axis.min() + " " + axis.max(), "data-y-scale", "linear").newline();
        axis.draw(svg, plotX, plotY, plotW, plotH, yLabel);

        double slot = plotW / bars.size();
        double width = Math.max(2, slot * 0.6);
        double zero = yOf.applyAsDouble(0);
        for (int i = 0; i < bars.size(); i++) {
            Bar b = bars.get(i);
            double centre = plotX + slot * (i + 0.5);
            svg.text("text", b.category(), "class", "x-tick", "x", centre, "y", plotY + plotH + 18, "text-anchor", "middle",
                    "fill", Palette.BLACK).newline();
            if (!Double.isFinite(b.value())) {
                svg.text("text", "n/a", "class", "bar-note", "x", centre, "y", zero - 6, "text-anchor", "middle", "fill", Palette.GREY_TEXT)
                        .newline();
                continue;
            }
            double top = yOf.applyAsDouble(Math.max(0, b.value()));
            double bottom = yOf.applyAsDouble(Math.min(0, b.value()));
            svg.open("rect", "class", "bar", "data-category", b.category(), "data-value", String.valueOf(b.value()),
                    "x", centre - width / 2, "y", top, "width", width, "height", Math.max(0.0, bottom - top), "fill", colour);
            svg.text("title", b.category() + ": " + b.note()).close("rect").newline();
            double noteY = b.value() >= 0 ? top - 6 : bottom + 15;
            svg.text("text", b.note(), "class", "bar-note", "x", centre, "y", noteY, "text-anchor", "middle", "fill", Palette.BLACK,
                    "font-size", "11").newline();
        }
        svg.empty("line", "x1", plotX, "x2", plotX + plotW, "y1", zero, "y2", zero, "stroke", Palette.BLACK, "stroke-width", "1");
        svg.text("text", xLabel, "class", "axis-label", "x", plotX + plotW / 2, "y", frame.height() - 12, "text-anchor", "middle",
                "fill", Palette.BLACK).newline();
        svg.close("g").newline();
        return svg.close("svg").newline().toString();
    }
}
