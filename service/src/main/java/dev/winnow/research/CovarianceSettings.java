package dev.winnow.research;

import java.time.LocalDate;

/**
 * How a factor covariance is estimated: the sample's last date ({@code to}, null for the last common date), its
 * length ({@code window}, null for every common date), the half-life of exponential weights (null for equal
 * weights) and the Newey-West lags.
 */
public record CovarianceSettings(LocalDate to, Integer window, Double halfLife, int nwLags) {
    public static final int MAX_LAGS = 1000;
    public static final int MAX_WINDOW = 1_000_000;

    /** Checks what the HTTP forms cannot: a half-life, when given, is a positive finite number of periods. */
    public CovarianceSettings {
        if (halfLife != null && !(halfLife > 0 && Double.isFinite(halfLife))) {
            throw new InvalidRequestException("half_life must be a positive number of periods, got " + halfLife + ".");
        }
        if (nwLags < 0 || nwLags > MAX_LAGS) {
            throw new InvalidRequestException("nw_lags must be between 0 and " + MAX_LAGS + ", got " + nwLags + ".");
        }
    }

    /** Equal weights, no lags, every common date up to {@code to}. */
    public static CovarianceSettings defaults(LocalDate to) {
        return new CovarianceSettings(to, null, null, 0);
    }
}
