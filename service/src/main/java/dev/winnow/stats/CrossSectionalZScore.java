package dev.winnow.stats;

/**
 * Cross-sectional standardisation of a characteristic across securities, winsorised first so that a
 * few extreme values do not dominate the scale. Winsorising at 3 standard deviations before
 * standardising is common practice in fundamental risk models.
 *
 * <p>Over the securities with a value (NaN marks a missing one and stays NaN):
 * <pre>
 * m, s   = mean and sample standard deviation (n - 1 denominator) of the values
 * c_i    = min(max(x_i, m - 3 s), m + 3 s)
 * z_i    = (c_i - m') / s'   with m', s' the mean and sample standard deviation of the c_i
 * </pre>
 * The scores have mean 0 and standard deviation 1 over the present values.
 */
public final class CrossSectionalZScore {

    /** Winsorising limit in standard deviations (common practice). */
    public static final double DEFAULT_LIMIT = 3.0;

    private CrossSectionalZScore() {
    }

    /** Winsorised z-scores with the {@link #DEFAULT_LIMIT 3 standard deviation} limit. */
    public static double[] winsorisedZScores(double[] values) {
        return winsorisedZScores(values, DEFAULT_LIMIT);
    }

    /**
     * Winsorised z-scores clipping at {@code limit} standard deviations (see the class comment).
     *
     * @return a new array; all NaN when fewer than two values are present or all present values are equal
     * @throws IllegalArgumentException when values is null or holds an infinity, or limit is not positive
     */
    public static double[] winsorisedZScores(double[] values, double limit) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null; use NaN for a missing security");
        }
        if (!(limit > 0.0) || Double.isInfinite(limit)) {
            throw new IllegalArgumentException("winsorising limit must be a positive number of standard deviations, got " + limit);
        }
        for (int i = 0; i < values.length; i++) {
            if (Double.isInfinite(values[i])) {
                throw new IllegalArgumentException("value at index " + i + " is infinite; use NaN for a missing security");
            }
        }
        double[] clipped = values.clone();
        double[] moments = meanAndSampleSd(clipped);
        double lower = moments[0] - limit * moments[1];
        double upper = moments[0] + limit * moments[1];
        for (int i = 0; i < clipped.length; i++) {
            if (!Double.isNaN(clipped[i])) {
                clipped[i] = Math.min(Math.max(clipped[i], lower), upper);
            }
        }
        double[] clippedMoments = meanAndSampleSd(clipped);
        boolean defined = clippedMoments[1] > 0.0 && !allPresentEqual(values);
        for (int i = 0; i < clipped.length; i++) {
            clipped[i] = defined ? (clipped[i] - clippedMoments[0]) / clippedMoments[1] : Double.NaN;
        }
        return clipped;
    }

    /** Exact test: rounding in the mean can leave a tiny positive sd for identical values. */
    private static boolean allPresentEqual(double[] values) {
        double first = Double.NaN;
        for (double v : values) {
            if (!Double.isNaN(v)) {
                if (Double.isNaN(first)) {
                    first = v;
                } else if (v != first) {
                    return false;
                }
            }
        }
        return true;
    }

    /** {mean, sample sd} of the non-NaN values, NaN where undefined (fewer than 2 values). */
    private static double[] meanAndSampleSd(double[] values) {
        int count = 0;
        double sum = 0.0;
        for (double v : values) {
            if (!Double.isNaN(v)) {
                count++;
                sum += v;
            }
        }
        double mean = count > 0 ? sum / count : Double.NaN;
        double squares = 0.0;
        for (double v : values) {
            if (!Double.isNaN(v)) {
                squares += (v - mean) * (v - mean);
            }
        }
        double sd = count > 1 ? Math.sqrt(squares / (count - 1)) : Double.NaN;
        return new double[] {mean, sd};
    }
}
