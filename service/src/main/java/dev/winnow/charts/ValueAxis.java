package dev.winnow.charts;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;

/**
 * A vertical value axis: its domain and ticks. Linear axes step by 1, 2, 2.5 or 5 times a power of ten with the
 * domain widened to whole steps; log axes (base 10) tick at 1, 2 and 5 times powers of ten (all of 1 to 9 when the
 * range spans less than that gives three ticks; only powers of ten when it spans many decades).
 *
 * @param log   whether positions are proportional to log10 of the value
 * @param min   lowest value of the domain (positive on a log axis)
 * @param max   highest value of the domain
 * @param ticks tick values with their labels, lowest first
 */
public record ValueAxis(boolean log, double min, double max, List<Tick> ticks) {

    /** How tick labels are written. */
    public enum Format { NUMBER, PERCENT }

    public record Tick(double value, String label) {
    }

    /** A linear axis covering every value in {@code values} (finite ones) and the extra values given. */
    static ValueAxis linear(double lo, double hi, int targetTicks, Format format) {
        if (!(lo <= hi) || !Double.isFinite(lo) || !Double.isFinite(hi)) {
            throw new IllegalArgumentException("a linear axis needs finite lo <= hi, got " + lo + ", " + hi);
        }
        if (lo == hi) {
            double pad = lo == 0 ? 1 : Math.abs(lo) * 0.1;
            lo -= pad;
            hi += pad;
        }
        double scale = format == Format.PERCENT ? 100 : 1;
        BigDecimal step = niceStep((hi - lo) * scale / Math.max(1, targetTicks - 1));
        double s = step.doubleValue() / scale;
        long first = (long) Math.floor(lo / s + 1e-9);
        long last = (long) Math.ceil(hi / s - 1e-9);
        List<Tick> ticks = new ArrayList<>();
        for (long k = first; k <= last; k++) {
            BigDecimal label = step.multiply(BigDecimal.valueOf(k));
            ticks.add(new Tick(label.doubleValue() / scale, text(label) + (format == Format.PERCENT ? "%" : "")));
        }
        return new ValueAxis(false, first * s, last * s, ticks);
    }

    /** A log10 axis from lo to hi (both positive), widened to the nearest tick at either end. */
    static ValueAxis log10(double lo, double hi) {
        if (!(lo > 0) || !(hi >= lo) || !Double.isFinite(hi)) {
            throw new IllegalArgumentException("a log axis needs 0 < lo <= hi, got " + lo + ", " + hi);
        }
        if (lo == hi) {
            lo /= 1.25;
            hi *= 1.25;
        }
        List<BigDecimal> candidates = candidates(lo, hi, new int[]{1, 2, 5});
        if (candidates.size() < 3) {
            candidates = candidates(lo, hi, new int[]{1, 2, 3, 4, 5, 6, 7, 8, 9});
        } else if (candidates.size() > 12) {
            candidates = candidates(lo, hi, new int[]{1});
        }
        double min = Math.min(lo, candidates.isEmpty() ? lo : candidates.get(0).doubleValue());
        double max = Math.max(hi, candidates.isEmpty() ? hi : candidates.get(candidates.size() - 1).doubleValue());
        List<Tick> ticks = new ArrayList<>();
        for (BigDecimal c : candidates) {
            ticks.add(new Tick(c.doubleValue(), text(c)));
        }
        return new ValueAxis(true, min, max, ticks);
    }

    /** Multiples m x 10^k within one step of [lo, hi] on either side, so the domain ends on a tick. */
    private static List<BigDecimal> candidates(double lo, double hi, int[] multipliers) {
        int k0 = (int) Math.floor(Math.log10(lo)) - 1;
        int k1 = (int) Math.ceil(Math.log10(hi)) + 1;
        List<BigDecimal> all = new ArrayList<>();
        for (int k = k0; k <= k1; k++) {
            for (int m : multipliers) {
                all.add(BigDecimal.valueOf(m).scaleByPowerOfTen(k));
            }
        }
        int below = -1;
        int above = all.size();
        for (int i = 0; i < all.size(); i++) {
            double v = all.get(i).doubleValue();
            if (v <= lo * (1 + 1e-12)) {
                below = i;
            }
            if (v >= hi * (1 - 1e-12) && above == all.size()) {
                above = i;
            }
        }
        return new ArrayList<>(all.subList(Math.max(0, below), Math.min(all.size(), above + 1)));
    }

    /** The 1, 2, 2.5 or 5 x 10^k at or above {@code raw}. */
    static BigDecimal niceStep(double raw) {
        if (!(raw > 0) || !Double.isFinite(raw)) {
            throw new IllegalArgumentException("step must be positive and finite, got " + raw);
        }
        int k = (int) Math.floor(Math.log10(raw));
        for (int attempt = 0; attempt < 2; attempt++, k++) {
            for (String m : new String[]{"1", "2", "2.5", "5", "10"}) {
                BigDecimal candidate = new BigDecimal(m).scaleByPowerOfTen(k);
                if (candidate.doubleValue() >= raw * (1 - 1e-12)) {
                    return candidate;
                }
            }
        }
        throw new IllegalStateException("no step for " + raw);
    }

    private static String text(BigDecimal v) {
        BigDecimal s = v.stripTrailingZeros();
        if (s.signum() == 0) {
            return "0";
        }
        return (s.scale() < 0 ? s.setScale(0) : s).toPlainString().replace('-', '\u2212');
    }

    /** Where {@code value} is drawn in a plot area from plotY (top) down plotH pixels. */
    double y(double value, double plotY, double plotH) {
        return plotY + plotH - fraction(value) * plotH;
    }

    /** Grid lines and labelled ticks across the plot area, and the axis label rotated along its left side. */
    void draw(Svg svg, double plotX, double plotY, double plotW, double plotH, String label) {
        svg.open("g", "class", "y-axis").newline();
        for (Tick t : ticks) {
            double y = y(t.value(), plotY, plotH);
            svg.empty("line", "x1", plotX, "x2", plotX + plotW, "y1", y, "y2", y, "stroke", Palette.GRID, "stroke-width", "1");
            svg.text("text", t.label(), "class", "y-tick", "data-value", String.valueOf(t.value()), "x", plotX - 6, "y", y + 4,
                    "text-anchor", "end", "fill", Palette.BLACK).newline();
        }
        svg.text("text", label, "class", "axis-label", "transform", "translate(16 " + Svg.num(plotY + plotH / 2) + ") rotate(-90)",
                "text-anchor", "middle", "fill", Palette.BLACK).newline();
        svg.close("g").newline();
    }

    /** The position of {@code value} between the domain ends, 0 at min and 1 at max. */
    double fraction(double value) {
        if (log) {
            return (Math.log10(value) - Math.log10(min)) / (Math.log10(max) - Math.log10(min));
        }
        return (value - min) / (max - min);
    }
}
