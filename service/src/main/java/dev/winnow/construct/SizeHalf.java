package dev.winnow.construct;

/**
 * Universe restriction to one half of the eligible securities by market capitalisation at each formation:
 * SMALL keeps those at or below the type-7 median of market_cap among the eligible, BIG those above it.
 */
public enum SizeHalf {
    SMALL,
    BIG
}
