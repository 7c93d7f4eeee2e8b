package dev.winnow.construct;

import dev.winnow.stats.Frequency;

import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * What a security-loadings regression uses: the factors in order, the window W (grid dates ending at the as-of
 * date) and the minimum number of usable dates M below which a security gets no loadings.
 *
 * <p>Every check happens here, with messages that name the query parameters, so callers can pass them on.
 */
public record LoadingsSpec(List<String> factors, int window, int minObs) {

    public LoadingsSpec {
        if (factors == null || factors.isEmpty()) {
            throw new IllegalArgumentException("factors must name at least one factor");
        }
        factors = List.copyOf(factors);
        Set<String> seen = new HashSet<>();
        for (String f : factors) {
            if (f == null || f.isBlank()) {
                throw new IllegalArgumentException("factor names must not be empty");
            }
            if (!seen.add(f)) {
                throw new IllegalArgumentException("factor '" + f + "' is listed twice; list each factor once");
            }
        }
        int floor = minimumObservations(factors.size());
        if (window < floor) {
            throw new IllegalArgumentException("window must be at least the number of factors + 2 = " + floor
                    + " (an intercept, " + factors.size() + " betas and one residual degree of freedom), got " + window);
        }
        if (minObs < floor || minObs > window) {
            throw new IllegalArgumentException("min_obs must be from " + floor + " (factors + 2) to the window " + window
                    + ", got " + minObs);
        }
    }

    /**
     * Default window by panel frequency: daily 252, weekly 104, monthly 60, quarterly 20, annual 10 grid dates
     * (about one year of daily data, two years of weekly and five of monthly data; these are our choice).
     */
    public static int defaultWindow(Frequency frequency) {
        return switch (frequency) {
            case DAILY -> 252;
            case WEEKLY -> 104;
            case MONTHLY -> 60;
            case QUARTERLY -> 20;
            case ANNUAL -> 10;
        };
    }

    /**
     * Default minimum of usable dates: W / 2 (integer division), raised to factors + 2 when that is larger, so that
     * every reported regression has a residual degree of freedom (the raise is our choice).
     */
    public static int defaultMinObs(int window, int factorCount) {
        return Math.max(window / 2, minimumObservations(factorCount));
    }

    /** The spec with the defaults filled in for whatever was not given (null). */
    public static LoadingsSpec withDefaults(List<String> factors, Integer window, Integer minObs, Frequency frequency) {
        if (factors == null || factors.isEmpty()) {
            throw new IllegalArgumentException("factors must name at least one factor");
        }
        int w = window != null ? window : defaultWindow(frequency);
        int m = minObs != null ? minObs : Math.min(defaultMinObs(w, factors.size()), w);
        return new LoadingsSpec(factors, w, m);
    }

    /** Intercept + k betas + one residual degree of freedom. */
    private static int minimumObservations(int factorCount) {
        return factorCount + 2;
    }

    public int factorCount() {
        return factors.size();
    }
}
