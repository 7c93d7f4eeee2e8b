package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonUnwrapped;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.PanelSource;
import dev.winnow.construct.FormingThreads;
import dev.winnow.construct.SegmentRebuild;
import dev.winnow.research.TrialLibrary.Trial;
import dev.winnow.stats.EvidenceVerdicts;
import dev.winnow.stats.EvidenceVerdicts.BreadthTally;
import dev.winnow.stats.EvidenceVerdicts.Section;
import dev.winnow.stats.MonthlyBasis;
import dev.winnow.stats.PeriodStatistics;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The breadth section: the factor's definition rebuilt from its panel inside each segment ({@link SegmentRebuild}),
 * each segment's series put on the monthly basis. Rebuilding reads the whole panel once per segment (and once more to
 * find a label column's values), so on a large daily panel this section takes as long as that many factor builds.
 */
public final class Breadth {
    /** Most segments a label column may define; more would mean as many full builds in one request. */
    static final int MAX_SEGMENTS = 50;

    private final PanelStore panels;
    private final FactorStore factors;
    private final FormingThreads forming;

    /** @param forming the threads each segment's build forms ahead on, shared with the service */
    public Breadth(PanelStore panels, FactorStore factors, FormingThreads forming) {
        this.panels = panels;
        this.factors = factors;
        this.forming = java.util.Objects.requireNonNull(forming, "forming");
    }

    /** Answers 400 unless {@code column} is a label column of the factor's panel (nothing to check without a panel). */
    public void checkSegment(Trial trial, String column) {
        Long panelId = trial.version().panelId();
        if (column == null || panelId == null) {
            return;
        }
        Map<String, String> columns = panels.columns(panelId);
        if (!"label".equals(columns.get(column))) {
            List<String> labels = columns.entrySet().stream().filter(e -> "label".equals(e.getValue())).map(Map.Entry::getKey).sorted().toList();
            throw new InvalidRequestException("'segment' must name a label column of the factor's panel; '" + column + "' is not one. "
                    + "Label columns: " + (labels.isEmpty() ? "(none)" : String.join(", ", labels)) + ".");
        }
    }

    /** The breadth section's numbers: the segment column, one row per segment, and the tally. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Numbers(String segment, List<SegmentRow> segments, int counted, int sameSign) {
    }

    /** One segment: its label value (or size half) and the monthly statistics of the rebuilt series. */
    public record SegmentRow(String value, @JsonUnwrapped PeriodStatistics statistics) {
    }

    public EvidenceJson.Section<Numbers> section(Trial trial, String column, double fullMean) {
        FactorDefinition def = trial.definition();
        Long panelId = trial.version().panelId();
        if (def == null || !SegmentRebuild.supports(def) || panelId == null) {
            return unavailable(column, "The series is uploaded, not built from a panel, so it cannot be rebuilt inside segments.");
        }
        if (column == null && !panels.columns(panelId).containsKey("market_cap")) {
            return unavailable(null, "The panel has no market_cap column to split into size halves; name a label column with 'segment'.");
        }
        ReturnSeries riskFree = null;
        if (def.riskFree() != null) {
            Optional<FactorVersionRecord> rf = factors.current(def.riskFree());
            if (rf.isEmpty()) {
                return unavailable(column, "The risk-free factor '" + def.riskFree() + "' that the definition subtracts no longer exists.");
            }
            riskFree = factors.series(rf.get().factorId(), rf.get().version(), FactorStore.Leg.SPREAD);
        }
        PanelSource panel = panels.source(panelId);
        List<SegmentRebuild.Segment> segments;
        if (column == null) {
            segments = SegmentRebuild.bySizeHalf(def, panel, riskFree, forming);
        } else {
            List<String> values = SegmentRebuild.distinctLabels(panel, column);
            if (values.size() > MAX_SEGMENTS) {
                throw new InvalidRequestException("Label column '" + column + "' has " + values.size() + " distinct values; breadth rebuilds the factor "
                        + "once per value, at most " + MAX_SEGMENTS + ". Choose a coarser label column.");
            }
            segments = SegmentRebuild.byLabel(def, panel, riskFree, column, values, forming);
        }
        List<PeriodStatistics> statistics = new ArrayList<>();
        List<SegmentRow> rows = new ArrayList<>();
        for (SegmentRebuild.Segment segment : segments) {
            PeriodStatistics s = PeriodStatistics.of(MonthlyBasis.of(segment.spread()).monthly());
            statistics.add(s);
            rows.add(new SegmentRow(segment.value(), s));
        }
        BreadthTally tally = EvidenceVerdicts.tallyBreadth(statistics, fullMean);
        return EvidenceJson.section(numbers(column, rows, tally), EvidenceVerdicts.breadth(tally), null);
    }

    /** The section's numbers with no segment built. */
    public static Numbers emptyNumbers(String column) {
        return numbers(column, List.of(), new BreadthTally(0, 0));
    }

    private static EvidenceJson.Section<Numbers> unavailable(String column, String reason) {
        return EvidenceJson.section(emptyNumbers(column), EvidenceVerdicts.notEnoughData(Section.BREADTH, reason), null);
    }

    private static Numbers numbers(String column, List<SegmentRow> rows, BreadthTally tally) {
        return new Numbers(column == null ? SegmentRebuild.SIZE_HALVES : column, rows, tally.counted(), tally.sameSign());
    }
}
