package dev.winnow.construct;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.Collections;
import java.util.Map;
import java.util.Objects;

/**
 * One date's rows of a panel, column by column. Row i belongs to security {@code securityIds[i]}
 * (panel-local integer ids, strictly increasing). Missing numbers are NaN, missing labels null.
 * The row at date d holds the return of the period ending at d and the characteristics known at the end of d.
 *
 * <p>Arrays are shared, not copied, for speed: producers hand over fresh arrays and nobody mutates them.
 */
public record CrossSection(
        LocalDate date,
        int[] securityIds,
        double[] returns,
        double[] marketCaps,
        Map<String, double[]> numbers,
        Map<String, String[]> labels) {

    public CrossSection {
        Objects.requireNonNull(date, "date");
        int n = securityIds.length;
        if (returns.length != n || marketCaps.length != n) {
            throw new IllegalArgumentException("column lengths differ from the number of securities at " + date);
        }
        for (int i = 1; i < n; i++) {
            if (securityIds[i] <= securityIds[i - 1]) {
                throw new IllegalArgumentException("security ids must increase strictly at " + date);
            }
        }
        numbers = Collections.unmodifiableMap(numbers);
        labels = Collections.unmodifiableMap(labels);
        numbers.forEach((k, v) -> {
            if (v.length != n) {
                throw new IllegalArgumentException("column " + k + " has " + v.length + " rows, expected " + n);
            }
        });
        labels.forEach((k, v) -> {
            if (v.length != n) {
                throw new IllegalArgumentException("column " + k + " has " + v.length + " rows, expected " + n);
            }
        });
    }

    public int size() {
        return securityIds.length;
    }

    /** Row index of a security, or a negative number when it has no row at this date. */
    public int rowOf(int securityId) {
        return Arrays.binarySearch(securityIds, securityId);
    }

    /**
     * Values of a numeric column: the market_cap and return columns by their names, other numeric columns from
     * {@link #numbers}. A column absent at this date reads as all missing (NaN).
     */
    public double[] numberColumn(String name) {
        if ("return".equals(name)) {
            return returns;
        }
        if ("market_cap".equals(name)) {
            return marketCaps;
        }
        double[] values = numbers.get(name);
        if (values == null) {
            values = new double[size()];
            Arrays.fill(values, Double.NaN);
        }
        return values;
    }

    /** Values of a label column; a column absent at this date reads as all missing (null). */
    public String[] labelColumn(String name) {
        String[] values = labels.get(name);
        return values != null ? values : new String[size()];
    }
}
