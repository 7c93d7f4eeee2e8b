package dev.winnow.construct;

import java.util.List;

/**
 * What one build (or resume) produced: the new observations and formations, the state to resume from, and how many
 * of the periods it processed after the first formation had no factor return.
 */
public record BuildResult(List<FactorObservation> observations, List<Formation> formations, EngineState endState,
                          int periodsWithoutReturn) {

    public BuildResult {
        observations = List.copyOf(observations);
        formations = List.copyOf(formations);
    }
}
