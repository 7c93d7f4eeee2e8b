package dev.winnow.stats;

import java.util.Locale;

/** The plain verdict of one evidence section; see {@link EvidenceVerdicts} for the rules. */
public enum Verdict {
    HOLDS,
    WEAK,
    FAILS,
    NOT_ENOUGH_DATA;

    /** Lower-case name used on the wire ({@code holds}, {@code not_enough_data}, ...). */
    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }
}
