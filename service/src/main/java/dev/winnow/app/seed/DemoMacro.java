package dev.winnow.app.seed;

/**
 * The invented economy's monthly series over the whole simulated calendar (burn-in included): the risk-free rate,
 * the market excess return, sector shocks and the three external series. Index 0 is the first burn-in month.
 * Values are already rounded to what the files show.
 */
final class DemoMacro {

    /** Long-run annual short rate the rate path reverts to. */
    private static final double MEAN_ANNUAL_RATE = 0.03;
    private static final double RATE_REVERSION = 0.04;
    private static final double RATE_SHOCK = 0.0025;
    private static final double MAX_ANNUAL_RATE = 0.06;
    private static final double MIN_ANNUAL_RATE = 0.0005;
    private static final double MARKET_PREMIUM = 0.005;
    private static final double MARKET_VOLATILITY = 0.043;
    private static final double SECTOR_VOLATILITY = 0.018;
    /** Years of duration that turn a yield change into a long-bond return. */
    private static final double LONG_BOND_DURATION = 7.0;

    private final double[] riskFree;
    private final double[] marketExcess;
    private final double[] termSpread;
    private final double[] creditSpread;
    private final double[] inflationSurprise;
    private final double[][] sectorShocks;

    private DemoMacro(int length, int sectors) {
        riskFree = new double[length];
        marketExcess = new double[length];
        termSpread = new double[length];
        creditSpread = new double[length];
        inflationSurprise = new double[length];
        sectorShocks = new double[length][sectors];
    }

    /**
     * Draws {@code length} months. The annual short rate y follows a mean-reverting path
     * y_t = y_{t-1} + kappa (mu - y_{t-1}) + sigma e_t (discrete Vasicek, Vasicek 1977) kept within [0.05%, 6%]; the
     * monthly risk-free return is y / 12. The market excess return is a fixed premium plus unit-variance Student t(5)
     * noise; the term spread is a small premium minus duration times the yield change plus noise; the credit spread
     * loads on the market; the inflation surprise is AR(1) with persistence 0.3.
     */
    static DemoMacro draw(int length, int sectors, SeededDraws draws) {
        DemoMacro macro = new DemoMacro(length, sectors);
        double rate = 0.05;
        double surprise = 0.0;
        for (int m = 0; m < length; m++) {
            double previousRate = rate;
            rate += RATE_REVERSION * (MEAN_ANNUAL_RATE - rate) + RATE_SHOCK * draws.gaussian();
            rate = Math.min(MAX_ANNUAL_RATE, Math.max(MIN_ANNUAL_RATE, rate));
            macro.riskFree[m] = PanelLayout.published(rate / 12.0);
            double market = MARKET_PREMIUM + MARKET_VOLATILITY * draws.unitStudentT(5);
            macro.marketExcess[m] = market;
            macro.termSpread[m] = PanelLayout.published(
                    0.0015 - LONG_BOND_DURATION * (rate - previousRate) + 0.012 * draws.gaussian());
            macro.creditSpread[m] = PanelLayout.published(0.0012 + 0.15 * market + 0.008 * draws.unitStudentT(5));
            surprise = 0.3 * surprise + 0.0018 * draws.gaussian();
            macro.inflationSurprise[m] = PanelLayout.published(surprise);
            for (int g = 0; g < sectors; g++) {
                macro.sectorShocks[m][g] = SECTOR_VOLATILITY * draws.gaussian();
            }
        }
        return macro;
    }

    double riskFree(int m) {
        return riskFree[m];
    }

    double marketExcess(int m) {
        return marketExcess[m];
    }

    double termSpread(int m) {
        return termSpread[m];
    }

    double creditSpread(int m) {
        return creditSpread[m];
    }

    double inflationSurprise(int m) {
        return inflationSurprise[m];
    }

    double sectorShock(int m, int sector) {
        return sectorShocks[m][sector];
    }
}
