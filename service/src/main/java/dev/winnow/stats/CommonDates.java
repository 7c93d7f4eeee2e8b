package dev.winnow.stats;

import java.time.LocalDate;
import java.util.List;

/** The dates every one of several series has, and each series' values on them (one array per series, in input order). */
record CommonDates(LocalDate[] dates, double[][] values) {
    int size() {
        return dates.length;
    }

    static CommonDates of(List<ReturnSeries> series) {
        DateAlignment.Union union = DateAlignment.union(series);
        LocalDate[] unionDates = unionDates(series, union);
        int[] kept = new int[union.size()];
        int m = 0;
        for (int u = 0; u < union.size(); u++) {
            boolean everywhere = true;
            for (double[] dense : union.dense()) {
                everywhere &= !Double.isNaN(dense[u]);
            }
            if (everywhere) {
                kept[m++] = u;
            }
        }
        LocalDate[] dates = new LocalDate[m];
        double[][] values = new double[series.size()][m];
        for (int k = 0; k < m; k++) {
            dates[k] = unionDates[kept[k]];
            for (int i = 0; i < series.size(); i++) {
                values[i][k] = union.dense()[i][kept[k]];
            }
        }
        return new CommonDates(dates, values);
    }

    static LocalDate[] unionDates(List<ReturnSeries> series, DateAlignment.Union union) {
        LocalDate[] dates = new LocalDate[union.size()];
        for (int i = 0; i < series.size(); i++) {
            int[] positions = union.positions()[i];
            for (int k = 0; k < positions.length; k++) {
                dates[positions[k]] = series.get(i).date(k);
            }
        }
        return dates;
    }
}
