package dev.winnow.research;

import java.util.List;

/**
 * The regression settings a loadings request gives: factors, window and min_obs, each null when left out
 * ({@link Regression#resolve} fills them in from the panel's config or by its frequency).
 */
public record LoadingsSettings(List<String> factors, Integer window, Integer minObs) {
    /** Largest window or min_obs a request may ask for. */
    public static final int MAX_WINDOW = 100_000;
}
