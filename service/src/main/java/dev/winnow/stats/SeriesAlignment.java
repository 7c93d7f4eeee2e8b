package dev.winnow.stats;

import java.time.LocalDate;
import java.util.List;

/**
 * Several return series laid side by side on one date axis, for a download of many factors at once.
 * <ul>
 *   <li>{@link Join#OUTER}: every date any series has (the union), NaN where a series has no return;</li>
 *   <li>{@link Join#INNER}: only the dates every series has (the intersection).</li>
 * </ul>
 * These are the outer and inner joins of relational algebra on the date column (Codd 1970; the outer join as in
 * SQL:1992). Values are copied unchanged: no filling, no interpolation.
 */
public final class SeriesAlignment {

    /** Which dates an alignment keeps. */
    public enum Join { OUTER, INNER }

    /**
     * The aligned table.
     *
     * @param dates  strictly increasing
     * @param values {@code values[i][t]} is series i's return at {@code dates[t]}, NaN where it has none
     */
    public record Aligned(LocalDate[] dates, double[][] values) {
        public int size() {
            return dates.length;
        }
    }

    private SeriesAlignment() {
    }

    public static Aligned align(List<ReturnSeries> series, Join join) {
        AnalyticsChecks.notNull(series, "series");
        AnalyticsChecks.notNull(join, "join");
        if (join == Join.INNER) {
            if (series.isEmpty()) {
                return new Aligned(new LocalDate[0], new double[0][]);
            }
            CommonDates common = CommonDates.of(series);
            return new Aligned(common.dates(), common.values());
        }
        DateAlignment.Union union = DateAlignment.union(series);
        return new Aligned(CommonDates.unionDates(series, union), union.dense());
    }
}
