package dev.winnow.stats;

/** Argument checks shared by the analytics classes; each failure names the argument and what to pass instead. */
final class AnalyticsChecks {

    private AnalyticsChecks() {
    }

    static <T> T notNull(T value, String name) {
        if (value == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        return value;
    }

    static int atLeast(int value, int minimum, String name) {
        if (value < minimum) {
            throw new IllegalArgumentException(name + " must be at least " + minimum + ", got " + value);
        }
        return value;
    }

    static double[] finiteValues(double[] values, String name) {
        notNull(values, name);
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException(name + "[" + i + "] is " + values[i] + "; pass finite numbers only (drop missing periods)");
            }
        }
        return values;
    }

    /** Explicit lag count, or null for the automatic rule; an explicit count must be non-negative. */
    static Integer lagsOrNull(Integer lags) {
        if (lags != null && lags < 0) {
            throw new IllegalArgumentException("lags must be 0 or more (or null for the automatic choice), got " + lags);
        }
        return lags;
    }
}
