package dev.winnow.construct;

/** The market portfolio: every eligible security (positive market cap, universe applied), one long leg. */
final class MarketRule implements PortfolioRule {
    private final FactorDefinition def;
    private final boolean capWeighted;

    MarketRule(FactorDefinition def) {
        this.def = def;
        this.capWeighted = PortfolioRule.capWeighted(def);
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        return new Holding[] {Holding.of(rows, Eligibility.eligibleRows(def, rows, null), capWeighted)};
    }

    @Override
    public int[] longLeg() {
        return new int[] {0};
    }

    @Override
    public int[] shortLeg() {
        return new int[0];
    }
}
