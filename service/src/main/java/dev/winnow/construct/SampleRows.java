package dev.winnow.construct;

/**
 * The securities of a formation cross-section that cross-sectional studies use, by the same eligibility rules as
 * construction ({@link Eligibility}) so that a study and a factor agree on who is in the sample.
 */
public final class SampleRows {
    private SampleRows() {
    }

    /** Rows passing the universe restrictions only (minimum cap, label lists), increasing. */
    public static int[] inUniverse(Universe universe, CrossSection xs) {
        return Eligibility.rows(universe == null ? Universe.ALL : universe, xs, null, false);
    }

    /**
     * Rows a formation of {@code def} would consider for its signal: a finite signal value in {@code signal} (one per
     * row of {@code xs}) and the definition's universe, but not the market-cap requirement of cap weighting or the
     * 2x3 sort.
     */
    public static int[] withSignal(FactorDefinition def, CrossSection xs, double[] signal) {
        if (signal.length != xs.size()) {
            throw new IllegalArgumentException("signal has " + signal.length + " values for " + xs.size() + " rows");
        }
        return Eligibility.rows(def.effectiveUniverse(), xs, signal, false);
    }
}
