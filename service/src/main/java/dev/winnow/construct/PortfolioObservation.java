package dev.winnow.construct;

import java.time.LocalDate;

/**
 * One period's returns of a factor's stored portfolios, in the order of their names (see
 * {@link FactorEngine#portfolioNames}); NaN for a portfolio without a return that period (empty at its formation, or
 * no member with a return).
 */
public record PortfolioObservation(LocalDate date, double[] returns) {
    public PortfolioObservation {
        returns = returns.clone();
    }

    @Override
    public double[] returns() {
        return returns.clone();
    }

    /** The return of portfolio {@code k}. */
    public double returnOf(int k) {
        return returns[k];
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof PortfolioObservation p && date.equals(p.date) && java.util.Arrays.equals(returns, p.returns);
    }

    @Override
    public int hashCode() {
        return 31 * date.hashCode() + java.util.Arrays.hashCode(returns);
    }
}
