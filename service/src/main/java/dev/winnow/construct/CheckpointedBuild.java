package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Runs {@link FactorEngine} in segments of a fixed number of grid dates and keeps the engine state at the end of each
 * segment, so that a later revision can resume from the last checkpoint before its first changed date instead of
 * rebuilding from the first date. Segment ends fall on multiples of the segment length counted from the grid's first
 * date, whatever the starting state, so builds, extensions and revisions agree on where checkpoints are.
 *
 * <p>Each segment resumes from the previous one's end state, which the engine guarantees gives the same bits as
 * one pass (see {@link FactorEngine}); the only extra work is re-reading {@code lag} cross-sections per segment.
 */
public final class CheckpointedBuild {
    private CheckpointedBuild() {
    }

    /**
     * The engine state after the first {@code state.processedDates()} grid dates, with the build's cumulative counts
     * up to there: observations stored and periods after the first formation that had no return.
     */
    public record Checkpoint(EngineState state, int observations, int periodsWithoutReturn) {
    }

    /** The whole run as one build result, and the checkpoints it passed, in grid order. */
    public record Result(BuildResult build, List<Checkpoint> checkpoints) {
        public Result {
            checkpoints = List.copyOf(checkpoints);
        }
    }

    /**
     * @param resume              the state to continue from, or null to build from the first date
     * @param observationsBefore  observations stored before {@code resume} (0 from scratch), for the checkpoints' counts
     * @param missingBefore       periods without return before {@code resume} (0 from scratch), likewise
     * @param segmentDates        grid dates per segment, at least 1
     * @param forming             the threads a segment of {@link FactorEngine#FORMED_AHEAD_MIN_DATES} dates or more
     *                            forms ahead on ({@link FormingThreads#NONE}: all on the caller's thread; same bits)
     */
    public static Result run(FactorDefinition def, PanelSource panel, ReturnSeries riskFree, EngineState resume,
                             int observationsBefore, int missingBefore, int segmentDates, FormingThreads forming) {
        return run(def, panel, riskFree, Map.of(), resume, observationsBefore, missingBefore, segmentDates, forming);
    }

    /** As above, with the return series of the factors the signal recipe reads. */
    public static Result run(FactorDefinition def, PanelSource panel, ReturnSeries riskFree,
                             Map<String, ReturnSeries> signalFactors, EngineState resume,
                             int observationsBefore, int missingBefore, int segmentDates, FormingThreads forming) {
        if (segmentDates < 1) {
            throw new IllegalArgumentException("checkpoint segments need at least 1 grid date, got " + segmentDates);
        }
        int total = panel.dates().size();
        int done = resume == null ? 0 : resume.processedDates();
        EngineState state = resume;
        List<FactorObservation> observations = new ArrayList<>();
        List<Formation> formations = new ArrayList<>();
        List<PortfolioObservation> portfolios = new ArrayList<>();
        List<Checkpoint> checkpoints = new ArrayList<>();
        int missing = 0;
        BuildResult last = null;
        for (int end = (done / segmentDates + 1) * segmentDates; end <= total; end += segmentDates) {
            last = FactorEngine.build(def, new PanelPrefix(panel, end), riskFree, signalFactors, state, forming);
            observations.addAll(last.observations());
            formations.addAll(last.formations());
            portfolios.addAll(last.portfolioObservations());
            missing += last.periodsWithoutReturn();
            state = last.endState();
            checkpoints.add(new Checkpoint(state, observationsBefore + observations.size(), missingBefore + missing));
        }
        if (last == null || state.processedDates() < total) {
            last = FactorEngine.build(def, panel, riskFree, signalFactors, state, forming);
            observations.addAll(last.observations());
            formations.addAll(last.formations());
            portfolios.addAll(last.portfolioObservations());
            missing += last.periodsWithoutReturn();
        }
        return new Result(new BuildResult(observations, formations, last.endState(), missing, portfolios), checkpoints);
    }
}
