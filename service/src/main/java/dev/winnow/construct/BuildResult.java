package dev.winnow.construct;

import java.util.List;

/**
 * What one build (or resume) produced: the new observations and formations, the state to resume from, how many
 * of the periods it processed after the first formation had no factor return, and the stored portfolios' returns
 * (bucket portfolios of a sort, the six of a 2x3 sort) of every period where at least one of them has a return.
 */
public record BuildResult(List<FactorObservation> observations, List<Formation> formations, EngineState endState,
                          int periodsWithoutReturn, List<PortfolioObservation> portfolioObservations) {

    public BuildResult {
        observations = List.copyOf(observations);
        formations = List.copyOf(formations);
        portfolioObservations = List.copyOf(portfolioObservations);
    }
}
