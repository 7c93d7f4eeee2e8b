package dev.winnow.construct;

/** A rule that holds two sub-portfolios: the long leg (index 0) and the short leg (index 1). */
interface LongShortRule extends PortfolioRule {
    @Override
    default int[] longLeg() {
        return new int[] {0};
    }

    @Override
    default int[] shortLeg() {
        return new int[] {1};
    }
}
