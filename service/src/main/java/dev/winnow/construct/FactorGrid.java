package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;

/**
 * Factor returns aligned to a panel's date grid by exact date: {@code value(j, t)} is factor j's return on grid date t,
 * NaN where the factor has no return on that date. Factor dates off the grid are ignored.
 */
public final class FactorGrid {
    private static final long FNV_OFFSET = 0xcbf29ce484222325L;
    private static final long FNV_PRIME = 0x100000001b3L;

    private final List<LocalDate> grid;
    private final double[][] values;

    private FactorGrid(List<LocalDate> grid, double[][] values) {
        this.grid = grid;
        this.values = values;
    }

    /** Aligns each series to the grid (strictly increasing dates). */
    public static FactorGrid align(List<ReturnSeries> factors, List<LocalDate> grid) {
        if (factors == null || factors.isEmpty()) {
            throw new IllegalArgumentException("at least one factor series is needed");
        }
        List<LocalDate> dates = List.copyOf(grid);
        double[][] values = new double[factors.size()][dates.size()];
        for (int j = 0; j < values.length; j++) {
            ReturnSeries series = factors.get(j);
            double[] row = values[j];
            Arrays.fill(row, Double.NaN);
            int s = 0;
            for (int t = 0; t < row.length && s < series.size(); t++) {
                LocalDate d = dates.get(t);
                while (s < series.size() && series.date(s).isBefore(d)) {
                    s++;
                }
                if (s < series.size() && series.date(s).equals(d)) {
                    row[t] = series.value(s);
                }
            }
        }
        return new FactorGrid(dates, values);
    }

    public List<LocalDate> dates() {
        return grid;
    }

    public int factorCount() {
        return values.length;
    }

    public double value(int factor, int gridIndex) {
        return values[factor][gridIndex];
    }

    /** First grid index of the window of {@code window} dates ending at {@code dateIndex} (shorter at the start). */
    public static int windowStart(int dateIndex, int window) {
        return Math.max(0, dateIndex - window + 1);
    }

    /** Copies of the factor columns over grid indices from..to inclusive, as regressor columns. */
    double[][] columns(int from, int to) {
        double[][] columns = new double[values.length][];
        for (int j = 0; j < values.length; j++) {
            columns[j] = Arrays.copyOfRange(values[j], from, to + 1);
        }
        return columns;
    }

    /**
     * A 64-bit FNV-1a hash (Fowler, Noll and Vo) of the window's grid dates (epoch days) and factor returns (IEEE bits,
     * NaN canonical), factor by factor. Equal digests mean, up to an accidental 64-bit collision, that loadings
     * computed for the date saw the same factor data, so a stored row can be kept when only a factor's data version moved.
     */
    public long digest(int dateIndex, int window) {
        int from = windowStart(dateIndex, window);
        long h = FNV_OFFSET;
        for (int t = from; t <= dateIndex; t++) {
            h = mix(h, grid.get(t).toEpochDay());
        }
        for (double[] factor : values) {
            for (int t = from; t <= dateIndex; t++) {
                h = mix(h, Double.doubleToLongBits(factor[t]));
            }
        }
        return h;
    }

    private static long mix(long h, long word) {
        for (int b = 0; b < 8; b++) {
            h ^= (word >>> (8 * b)) & 0xff;
            h *= FNV_PRIME;
        }
        return h;
    }
}
