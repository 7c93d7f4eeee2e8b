package dev.winnow.charts;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * A chart of dated series: lines (or a filled area down to zero), horizontal reference lines, vertical date markers,
 * labelled points and shaded date bands, on a date axis and a linear or log10 value axis.
 *
 * <p>The plotted coordinates are exact functions of the values: x is linear in the epoch day from the first to the
 * last date drawn, y linear in the value (or in its log10) over the value axis' domain. The root element states the
 * plot area and both domains ({@code data-plot}, {@code data-x-domain}, {@code data-y-domain}, {@code data-y-scale}),
 * and every line is a {@code polyline} or {@code path} with {@code data-series}, so a reader can map each point back
 * to its date and value. Every observation is drawn; nothing is thinned.
 */
public record TimeChart(String yLabel, ValueAxis.Format format, boolean log, List<Line> lines, List<Rule> rules,
                        List<DateMarker> dateMarkers, List<Point> points, List<Band> bands, List<Double> includeValues) {

    public enum Style { MAIN, THIN_DASHED, THIN_DOTTED, AREA }

    /** A series: its key (data-series), legend label, values by date, colour and style. */
    public record Line(String key, String label, LocalDate[] dates, double[] values, String colour, Style style) {
        public Line {
            if (dates.length != values.length) {
                throw new IllegalArgumentException("dates and values differ in length for " + key);
            }
        }
    }

    /** A horizontal reference line at a value. */
    public record Rule(double value, String label) {
    }

    /** A vertical marker at a date. */
    public record DateMarker(LocalDate date, String label) {
    }

    /** A labelled point (for example the trough of an episode). */
    public record Point(LocalDate date, double value, String label) {
    }

    /** A shaded stretch of dates; {@code to} is inclusive. */
    public record Band(LocalDate from, LocalDate to, String label) {
    }

    public TimeChart {
        lines = List.copyOf(lines);
        rules = List.copyOf(rules);
        dateMarkers = List.copyOf(dateMarkers);
        points = List.copyOf(points);
        bands = List.copyOf(bands);
        includeValues = List.copyOf(includeValues);
        if (lines.isEmpty() || lines.stream().allMatch(l -> l.dates().length == 0)) {
            throw new IllegalArgumentException("a time chart needs at least one non-empty line");
        }
        if (log && !rules.stream().allMatch(r -> r.value() > 0)) {
            throw new IllegalArgumentException("a log scale takes only positive reference lines");
        }
    }

    private static final int LEFT = 76;
    private static final int RIGHT = 24;
    private static final int TOP = 56;
    private static final int BOTTOM = 58;

    /** The SVG document. */
    public String render(ChartFrame frame) {
        double plotX = LEFT;
        double plotY = TOP;
        double plotW = frame.width() - LEFT - RIGHT;
        double plotH = frame.height() - TOP - BOTTOM;

        LocalDate first = null;
        LocalDate last = null;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (Line l : lines) {
            LocalDate[] d = l.dates();
            if (d.length == 0) {
                continue;
            }
            first = first == null || d[0].isBefore(first) ? d[0] : first;
            last = last == null || d[d.length - 1].isAfter(last) ? d[d.length - 1] : last;
            for (double v : l.values()) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
            if (l.style() == Style.AREA) {
                lo = Math.min(lo, 0);
                hi = Math.max(hi, 0);
            }
        }
        for (Rule r : rules) {
            lo = Math.min(lo, r.value());
            hi = Math.max(hi, r.value());
        }
        for (double v : includeValues) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        if (lo > hi) {
            lo = log ? 1 : 0;
            hi = lo;
        }
        long day0 = first.toEpochDay();
        long day1 = last.toEpochDay();
        if (day0 == day1) {
            day0 -= 1;
            day1 += 1;
        }
        int targetTicks = Math.max(3, (int) (plotH / 45));
        ValueAxis axis = log ? ValueAxis.log10(lo, hi) : ValueAxis.linear(lo, hi, targetTicks, format);
        final long d0 = day0;
        final long d1 = day1;
        java.util.function.DoubleUnaryOperator xOfDay = day -> plotX + (day - d0) / (double) (d1 - d0) * plotW;
        java.util.function.DoubleUnaryOperator yOf = v -> axis.y(v, plotY, plotH);

        Svg svg = frame.begin("time");
        svg.open("g", "id", "plot", "data-plot", Svg.num(plotX) + " " + Svg.num(plotY) + " " + Svg.num(plotW) + " " + Svg.num(plotH),
                "data-x-domain", LocalDate.ofEpochDay(d0) + " " + LocalDate.ofEpochDay(d1),
                "data-y-domain", axis.min() + " " + axis.max(), "data-y-scale", log ? "log10" : "linear").newline();

        // bands behind everything
        for (Band b : bands) {
            double x0 = xOfDay.applyAsDouble(Math.max(d0, b.from().toEpochDay()));
            double x1 = xOfDay.applyAsDouble(Math.min(d1, b.to().toEpochDay()));
            svg.open("rect", "class", "band", "x", x0, "y", plotY, "width", Math.max(1.0, x1 - x0), "height", plotH,
                    "fill", "#F2E6D0");
            svg.text("title", b.label()).close("rect").newline();
        }

        axis.draw(svg, plotX, plotY, plotW, plotH, yLabel);

        // date ticks
        int maxDateTicks = Math.max(2, (int) (plotW / 80));
        svg.open("g", "class", "x-axis").newline();
        for (TimeAxis.Tick t : TimeAxis.ticks(LocalDate.ofEpochDay(d0), LocalDate.ofEpochDay(d1), maxDateTicks)) {
            double x = xOfDay.applyAsDouble(t.date().toEpochDay());
            svg.empty("line", "x1", x, "x2", x, "y1", plotY + plotH, "y2", plotY + plotH + 5, "stroke", Palette.BLACK, "stroke-width", "1");
            svg.text("text", t.label(), "class", "x-tick", "data-date", t.date().toString(), "x", x, "y", plotY + plotH + 18,
                    "text-anchor", "middle", "fill", Palette.BLACK).newline();
        }
        svg.text("text", "Date (end of period)", "class", "axis-label", "x", plotX + plotW / 2, "y", frame.height() - 12,
                "text-anchor", "middle", "fill", Palette.BLACK).newline();
        svg.close("g").newline();
        svg.empty("rect", "x", plotX, "y", plotY, "width", plotW, "height", plotH, "fill", "none", "stroke", Palette.BLACK,
                "stroke-width", "1").newline();

        // reference lines
        for (Rule r : rules) {
            double y = yOf.applyAsDouble(r.value());
            svg.empty("line", "class", "rule", "data-value", String.valueOf(r.value()), "x1", plotX, "x2", plotX + plotW, "y1", y, "y2", y,
                    "stroke", Palette.GREY_TEXT, "stroke-width", "1.5", "stroke-dasharray", "6 4");
            svg.text("text", r.label(), "x", plotX + plotW - 4, "y", y - 4, "text-anchor", "end", "fill", Palette.GREY_TEXT).newline();
        }

        // series: a path per line, a gap wherever a value is undefined; an area is filled below its line
        for (Line l : lines) {
            LocalDate[] dates = l.dates();
            double[] values = l.values();
            if (dates.length == 0) {
                continue;
            }
            StringBuilder d = new StringBuilder(dates.length * 16);
            StringBuilder fill = new StringBuilder();
            double zeroY = l.style() == Style.AREA ? yOf.applyAsDouble(0) : 0;
            boolean inRun = false;
            String lastX = null;
            for (int i = 0; i < dates.length; i++) {
                if (!Double.isFinite(values[i])) {
                    if (inRun && l.style() == Style.AREA) {
                        fill.append(" L").append(lastX).append(',').append(Svg.num(zeroY)).append(" Z");
                    }
                    inRun = false;
                    continue;
                }
                String x = Svg.num(xOfDay.applyAsDouble(dates[i].toEpochDay()));
                String y = Svg.num(yOf.applyAsDouble(values[i]));
                if (d.length() > 0) {
                    d.append(' ');
                }
                d.append(inRun ? 'L' : 'M').append(x).append(',').append(y);
                if (l.style() == Style.AREA) {
                    if (!inRun) {
                        fill.append(fill.length() > 0 ? " " : "").append('M').append(x).append(',').append(Svg.num(zeroY));
                    }
                    fill.append(" L").append(x).append(',').append(y);
                }
                inRun = true;
                lastX = x;
            }
            if (inRun && l.style() == Style.AREA) {
                fill.append(" L").append(lastX).append(',').append(Svg.num(zeroY)).append(" Z");
            }
            if (l.style() == Style.AREA && fill.length() > 0) {
                svg.empty("path", "class", "area", "d", fill.toString(), "fill", l.colour(), "fill-opacity", "0.3", "stroke", "none",
                        "aria-hidden", "true").newline();
            }
            if (d.length() == 0) {
                continue;
            }
            svg.open("path", "class", "series", "data-series", l.key(), "d", d.toString(), "fill", "none",
                    "stroke", l.colour(), "stroke-width", l.style() == Style.MAIN ? "2" : l.style() == Style.AREA ? "1.5" : "1.25",
                    "stroke-dasharray", dash(l.style()), "stroke-linejoin", "round");
            svg.text("title", l.label()).close("path").newline();
        }

        // date markers
        for (DateMarker m : dateMarkers) {
            if (m.date().toEpochDay() < d0 || m.date().toEpochDay() > d1) {
                continue;
            }
            double x = xOfDay.applyAsDouble(m.date().toEpochDay());
            svg.empty("line", "class", "date-marker", "data-date", m.date().toString(), "x1", x, "x2", x, "y1", plotY, "y2", plotY + plotH,
                    "stroke", Palette.REDDISH_PURPLE, "stroke-width", "2", "stroke-dasharray", "2 3");
            svg.text("text", m.label(), "x", x + 4, "y", plotY + 14, "fill", Palette.BLACK).newline();
        }

        // labelled points
        for (Point p : points) {
            double x = xOfDay.applyAsDouble(p.date().toEpochDay());
            double y = yOf.applyAsDouble(p.value());
            svg.open("circle", "class", "marker", "data-date", p.date().toString(), "data-value", String.valueOf(p.value()),
                    "cx", x, "cy", y, "r", 4, "fill", "#FFFFFF", "stroke", Palette.BLACK, "stroke-width", "1.5");
            svg.text("title", p.label()).close("circle");
            svg.text("text", p.label().split(":")[0], "x", x, "y", y + 16, "text-anchor", "middle", "fill", Palette.BLACK, "font-size", "11")
                    .newline();
        }
        svg.close("g").newline();

        legend(svg, frame, plotX, plotW);
        return svg.close("svg").newline().toString();
    }

    /** One legend row above the plot, right-aligned, when more than one line is drawn. */
    private void legend(Svg svg, ChartFrame frame, double plotX, double plotW) {
        List<Line> shown = new ArrayList<>();
        for (Line l : lines) {
            if (l.dates().length > 0) {
                shown.add(l);
            }
        }
        if (shown.size() < 2) {
            return;
        }
        svg.open("g", "class", "legend").newline();
        double x = plotX;
        double y = TOP - 12;
        for (Line l : shown) {
            String dash = dash(l.style());
            svg.empty("line", "x1", x, "x2", x + 24, "y1", y - 4, "y2", y - 4, "stroke", l.colour(),
                    "stroke-width", l.style() == Style.MAIN ? "2" : "1.5", "stroke-dasharray", dash);
            svg.text("text", l.label(), "class", "legend-entry", "x", x + 30, "y", y, "fill", Palette.BLACK).newline();
            x += 30 + 7 * l.label().length() + 18;
        }
        svg.close("g").newline();
    }

    private static String dash(Style style) {
        return switch (style) {
            case THIN_DASHED -> "6 3";
            case THIN_DOTTED -> "1.5 2.5";
            default -> null;
        };
    }
}
