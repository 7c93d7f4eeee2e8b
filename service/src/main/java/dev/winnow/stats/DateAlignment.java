package dev.winnow.stats;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;

/** Aligns return series on dates by merging their sorted date arrays (no hashing). */
final class DateAlignment {

    private DateAlignment() {
    }

    /** The dates both series have, with each series' value there. */
    record Common(LocalDate[] dates, double[] x, double[] y) {
        int size() {
            return dates.length;
        }
    }

    /**
     * Several series laid on the union of their dates: {@code dense[i][u]} is series i's value at union position u,
     * NaN where it has none (values are finite, so NaN only marks absence); {@code positions[i][k]} is the union
     * position of series i's k-th observation.
     */
    record Union(int size, double[][] dense, int[][] positions) {
    }

    static Common common(ReturnSeries a, ReturnSeries b) {
        int capacity = Math.min(a.size(), b.size());
        LocalDate[] dates = new LocalDate[capacity];
        double[] x = new double[capacity];
        double[] y = new double[capacity];
        int m = 0;
        int i = 0;
        int j = 0;
        while (i < a.size() && j < b.size()) {
            int order = a.date(i).compareTo(b.date(j));
            if (order < 0) {
                i++;
            } else if (order > 0) {
                j++;
            } else {
                dates[m] = a.date(i);
                x[m] = a.value(i++);
                y[m++] = b.value(j++);
            }
        }
        return new Common(Arrays.copyOf(dates, m), Arrays.copyOf(x, m), Arrays.copyOf(y, m));
    }

    static Union union(List<ReturnSeries> series) {
        long[][] days = new long[series.size()][];
        long[] unionDays = new long[0];
        for (int i = 0; i < days.length; i++) {
            days[i] = epochDays(series.get(i));
            unionDays = mergeDistinct(unionDays, days[i]);
        }
        int size = unionDays.length;
        double[][] dense = new double[days.length][size];
        int[][] positions = new int[days.length][];
        for (int i = 0; i < days.length; i++) {
            Arrays.fill(dense[i], Double.NaN);
            positions[i] = new int[days[i].length];
            int u = 0;
            for (int k = 0; k < days[i].length; k++) {
                while (unionDays[u] != days[i][k]) {
                    u++;
                }
                positions[i][k] = u;
                dense[i][u] = series.get(i).value(k);
            }
        }
        return new Union(size, dense, positions);
    }

    private static long[] epochDays(ReturnSeries s) {
        long[] days = new long[s.size()];
        for (int k = 0; k < days.length; k++) {
            days[k] = s.date(k).toEpochDay();
        }
        return days;
    }

    /** Sorted union of two strictly increasing arrays. */
    private static long[] mergeDistinct(long[] a, long[] b) {
        if (Arrays.equals(a, b)) {
            return a;
        }
        long[] merged = new long[a.length + b.length];
        int m = 0;
        int i = 0;
        int j = 0;
        while (i < a.length || j < b.length) {
            long next;
            if (j == b.length || (i < a.length && a[i] < b[j])) {
                next = a[i++];
            } else if (i == a.length || b[j] < a[i]) {
                next = b[j++];
            } else {
                next = a[i++];
                j++;
            }
            merged[m++] = next;
        }
        return Arrays.copyOf(merged, m);
    }
}
