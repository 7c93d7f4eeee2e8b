package dev.winnow.app.seed;

/**
 * One fictional company of the demo market. Months are indices into the simulated calendar: 0 is the first published
 * month, negative indices are the unpublished burn-in. The company has rows from {@code firstMonth} through
 * {@code lastMonth} inclusive.
 *
 * @param delistingReturn the extra return of the final month when the company delists (compounded with the model
 *                        return), NaN when it is still listed at the end of the sample
 */
record DemoCompany(
        String security,
        String name,
        String sector,
        String tier,
        int firstMonth,
        int lastMonth,
        double beta,
        double idiosyncraticVolatility,
        double initialMarketCap,
        double delistingReturn) {

    boolean listedIn(int month) {
        return month >= firstMonth && month <= lastMonth;
    }

    boolean delists() {
        return !Double.isNaN(delistingReturn);
    }
}
