package dev.winnow.stats;

/**
 * Pearson correlation over every window of w consecutive pairs in O(n): running sums of deviations from a shift that
 * is reset to the window means every w steps (sums then recomputed from scratch), which keeps the sums small and the
 * rounding error bounded (see {@link ShiftedSums}). A window whose x or y values are all equal is NaN; this is
 * tracked exactly by counting adjacent unequal pairs.
 */
final class RollingPearson {

    private final double[] x;
    private final double[] y;
    private final int window;
    private double shiftX;
    private double shiftY;
    private double sumX;
    private double sumY;
    private double sumXX;
    private double sumYY;
    private double sumXY;
    private int changesX;
    private int changesY;

    private RollingPearson(double[] x, double[] y, int window) {
        this.x = x;
        this.y = y;
        this.window = window;
    }

    /** Correlation of x[s..s+w) with y[s..s+w) at index s, for s = 0..n-w. */
    static double[] compute(double[] x, double[] y, int window) {
        return new RollingPearson(x, y, window).run();
    }

    private double[] run() {
        double[] out = new double[x.length - window + 1];
        for (int start = 0; start < out.length; start++) {
            if (start % window == 0) {
                restart(start);
            } else {
                slide(start - 1, start + window - 1);
            }
            out[start] = current();
        }
        return out;
    }

    private void restart(int start) {
        shiftX = WindowMoments.mean(x, start, window);
        shiftY = WindowMoments.mean(y, start, window);
        sumX = sumY = sumXX = sumYY = sumXY = 0.0;
        changesX = changesY = 0;
        for (int t = start; t < start + window; t++) {
            add(t, 1.0);
            if (t > start) {
                changesX += x[t] != x[t - 1] ? 1 : 0;
                changesY += y[t] != y[t - 1] ? 1 : 0;
            }
        }
    }

    private void slide(int leaving, int entering) {
        add(leaving, -1.0);
        add(entering, 1.0);
        changesX += (x[entering] != x[entering - 1] ? 1 : 0) - (x[leaving + 1] != x[leaving] ? 1 : 0);
        changesY += (y[entering] != y[entering - 1] ? 1 : 0) - (y[leaving + 1] != y[leaving] ? 1 : 0);
    }

    private void add(int t, double sign) {
        double dx = x[t] - shiftX;
        double dy = y[t] - shiftY;
        sumX += sign * dx;
        sumY += sign * dy;
        sumXX += sign * dx * dx;
        sumYY += sign * dy * dy;
        sumXY += sign * dx * dy;
    }

    private double current() {
        if (changesX == 0 || changesY == 0) {
            return Double.NaN;
        }
        return ShiftedSums.correlation(window, sumX, sumY, sumXX, sumYY, sumXY);
    }
}
