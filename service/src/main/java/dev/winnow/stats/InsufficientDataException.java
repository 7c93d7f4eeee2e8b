package dev.winnow.stats;

/**
 * The data cannot identify the statistic asked for: too few common periods, or a singular covariance. The message says
 * what to change (more periods, fewer series, which series to drop); the API answers it as a 400.
 */
public final class InsufficientDataException extends IllegalArgumentException {
    public InsufficientDataException(String message) {
        super(message);
    }
}
