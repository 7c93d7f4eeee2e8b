package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Weighting;

/**
 * A method's formation rule: the sub-portfolios formed from a cross-section and how they combine into the long and
 * short legs (each leg is the equal-coefficient mean of its sub-portfolios).
 */
interface PortfolioRule {

    /**
     * The sub-portfolios formed on these rows, always the same number and order; empty ones are allowed.
     *
     * @param signal the definition's signal evaluated at these rows (aligned with them), null for methods without one
     */
    Holding[] form(CrossSection rows, double[] signal);

    /**
     * The same with the control signal of a dependent double sort (aligned with the rows); rules without one
     * ignore it.
     */
    default Holding[] form(CrossSection rows, double[] signal, double[] control) {
        return form(rows, signal);
    }

    /** Indices into {@link #form}'s result that make up the long leg. */
    int[] longLeg();

    /** Indices that make up the short leg; empty for a long-only factor. */
    int[] shortLeg();

    /**
     * The portfolios stored besides the legs, in order: each named and the equal-coefficient mean of some
     * sub-portfolios (like a leg). Sort: buckets "1".."B"; size_sort: the six 2x3 portfolios; none otherwise.
     */
    default java.util.List<Portfolio> portfolios() {
        return java.util.List.of();
    }

    /** A stored portfolio: its wire name and the sub-portfolios it averages. */
    record Portfolio(String name, int[] subs) {
    }

    static PortfolioRule of(FactorDefinition def) {
        return switch (def.method()) {
            case SORT -> def.within() != null ? new WithinGroupSortRule(def)
                    : def.control() != null ? new DependentDoubleSortRule(def) : new BucketSortRule(def);
            case RANK_WEIGHTED -> new RankWeightedRule(def);
            case SIZE_SORT -> new TwoByThreeRule(def);
            case MARKET -> new MarketRule(def);
            case EXTERNAL -> throw new IllegalArgumentException("method external has no formation rule");
        };
    }

    static boolean capWeighted(FactorDefinition def) {
        return def.effectiveWeighting() == Weighting.CAP;
    }
}
