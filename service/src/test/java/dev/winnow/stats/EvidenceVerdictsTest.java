package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The verdict rules as openapi.yaml documents them (schema FactorEvidence), on values chosen on either side of each
 * threshold: t_hurdle 3.0 (Harvey, Liu and Zhu 2016), t_weak 2.0, q 0.05, min_months 36, min_share 0.5 (common
 * practice or Winnow's choice, as EvidenceVerdicts says).
 */
class EvidenceVerdictsTest {

    @Test
    void significanceNeedsTheHurdleAndTheFalseDiscoveryRate() {
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.significance(row(120, 3.2, 0.001, 0.04)).verdict());
        assertEquals(Verdict.WEAK, EvidenceVerdicts.significance(row(120, 2.9, 0.004, 0.03)).verdict(), "t below 3");
        assertEquals(Verdict.WEAK, EvidenceVerdicts.significance(row(120, 3.2, 0.001, 0.06)).verdict(), "p_bh above q");
        assertEquals(Verdict.FAILS, EvidenceVerdicts.significance(row(120, 1.5, 0.13, 0.5)).verdict());
        SectionVerdict shortOne = EvidenceVerdicts.significance(row(35, 5.0, 0.0, 0.0));
        assertEquals(Verdict.NOT_ENOUGH_DATA, shortOne.verdict());
        assertEquals(Map.of("min_months", 36, "t_hurdle", 3.0, "q", 0.05), shortOne.thresholds());
    }

    @Test
    void stabilityNeedsBothHalvesAndMostRollingWindows() {
        PeriodStatistics up = new PeriodStatistics(LocalDate.of(2000, 1, 31), LocalDate.of(2004, 12, 31), 60, 0.01, 2.5);
        PeriodStatistics down = new PeriodStatistics(LocalDate.of(2005, 1, 31), LocalDate.of(2009, 12, 31), 60, -0.01, -2.5);
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.stability(120, 0.005, report(List.of(up, up), 0.5)).verdict());
        assertEquals(Verdict.WEAK, EvidenceVerdicts.stability(120, 0.005, report(List.of(up, up), 0.49)).verdict());
        assertEquals(Verdict.FAILS, EvidenceVerdicts.stability(120, 0.005, report(List.of(up, down), 0.9)).verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, EvidenceVerdicts.stability(59, 0.005, report(List.of(up, up), 0.9)).verdict());
    }

    @Test
    void breadthCountsSegmentsOfAtLeastThirtySixMonthsSharingTheSign() {
        PeriodStatistics positive = new PeriodStatistics(null, null, 36, 0.002, 1.0);
        PeriodStatistics negative = new PeriodStatistics(null, null, 100, -0.002, -1.0);
        PeriodStatistics tooShort = new PeriodStatistics(null, null, 35, -0.5, -9.0);
        EvidenceVerdicts.BreadthTally tally = EvidenceVerdicts.tallyBreadth(List.of(positive, positive, negative, tooShort), 0.01);
        assertEquals(new EvidenceVerdicts.BreadthTally(3, 2), tally);
        assertEquals(Verdict.WEAK, EvidenceVerdicts.breadth(tally).verdict());
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.breadth(new EvidenceVerdicts.BreadthTally(2, 2)).verdict());
        assertEquals(Verdict.FAILS, EvidenceVerdicts.breadth(new EvidenceVerdicts.BreadthTally(2, 1)).verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, EvidenceVerdicts.breadth(new EvidenceVerdicts.BreadthTally(1, 1)).verdict());
    }

    @Test
    void variantsAfterCostsRationaleAndRedundancy() {
        PeriodStatistics composite = new PeriodStatistics(null, null, 100, 0.004, 2.1);
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.variants("value", 0.003, new double[] {3.0, 0.5}, composite).verdict());
        assertEquals(Verdict.WEAK, EvidenceVerdicts.variants("value", 0.003, new double[] {3.0, -0.5}, composite).verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, EvidenceVerdicts.variants(null, 0.003, new double[] {3.0}, null).verdict());
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.afterCosts(true, 100, 0.002, 2.1).verdict());
        assertEquals(Verdict.WEAK, EvidenceVerdicts.afterCosts(true, 100, 0.002, 1.9).verdict());
        assertEquals(Verdict.FAILS, EvidenceVerdicts.afterCosts(true, 100, -0.001, -0.5).verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, EvidenceVerdicts.afterCosts(false, 100, 0.002, 2.1).verdict());
        assertEquals(Verdict.FAILS, EvidenceVerdicts.rationale("  ").verdict());
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.rationale("Investors underreact to news.").verdict());
        SpanningRegression explained = new SpanningRegression(120, 0.001, 1.2, 4, new double[] {0.9}, 0.8);
        SpanningRegression unexplained = new SpanningRegression(120, 0.004, -2.4, 4, new double[] {0.1}, 0.1);
        assertEquals(Verdict.FAILS, EvidenceVerdicts.redundancy(1, explained).verdict());
        assertEquals(Verdict.HOLDS, EvidenceVerdicts.redundancy(1, unexplained).verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, EvidenceVerdicts.redundancy(0, unexplained).verdict());
        assertTrue(EvidenceVerdicts.redundancy(1, explained).reason().contains("explain"));
    }

    private static TrialRow row(int n, double t, double p, double pBh) {
        TrialStatistics s = new TrialStatistics(n, 0.01, t, p, 0.2, 0.0, 3.0);
        return new TrialRow(s, p, p, pBh, pBh, Math.abs(t) > 3, 0.9, 0.8);
    }

    private static StabilityReport report(List<PeriodStatistics> halves, double share) {
        return new StabilityReport(halves, List.of(), 60, share, 2.0, null);
    }
}
