package dev.winnow.construct;

import java.util.Collections;
import java.util.Map;
import java.util.TreeMap;

/**
 * Restrictions of the securities eligible at a formation, applied in this order after the method's own
 * eligibility: minimum market cap (market_cap finite and {@code >= minMarketCap}), label include/exclude lists,
 * segment (label column equals value), then the size half (which needs market_cap finite and positive).
 * Every field is optional (null or empty).
 */
public record Universe(Double minMarketCap, Map<String, LabelFilter> labelFilters, SizeHalf sizeHalf, LabelEquals segment) {

    /** No restriction. */
    public static final Universe ALL = new Universe(null, Map.of(), null, null);

    public Universe {
        // sorted by column so that filters apply, and keys print, in one fixed order
        labelFilters = Collections.unmodifiableMap(new TreeMap<>(labelFilters == null ? Map.of() : labelFilters));
    }

    public Universe withMinMarketCap(Double value) {
        return new Universe(value, labelFilters, sizeHalf, segment);
    }

    public Universe withLabelFilter(String column, LabelFilter filter) {
        Map<String, LabelFilter> filters = new TreeMap<>(labelFilters);
        filters.put(column, filter);
        return new Universe(minMarketCap, filters, sizeHalf, segment);
    }

    public Universe withSizeHalf(SizeHalf value) {
        return new Universe(minMarketCap, labelFilters, value, segment);
    }

    public Universe withSegment(LabelEquals value) {
        return new Universe(minMarketCap, labelFilters, sizeHalf, value);
    }

    /** The label columns this universe reads: those its label filters name, and its segment's. */
    public java.util.Set<String> labelColumns() {
        java.util.Set<String> columns = new java.util.TreeSet<>(labelFilters.keySet());
        if (segment != null) {
            columns.add(segment.column());
        }
        return columns;
    }
}
