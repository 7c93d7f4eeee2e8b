package dev.winnow.construct;

import static dev.winnow.construct.Sections.nan;
import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.winnow.construct.FactorDefinition.Method;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Small examples of the sorts added with signal recipes, worked by hand from the rules (arithmetic in comments). */
class HandWorkedSignalSortsTest {
    private static final double EXACT = 1e-15;

    /*
     * Rank weights. Four securities, signals 1, 2, 3, 4 at the 2024-01-31 formation, returns .01 .02 .03 .04 on 2024-02-01.
     * Average ranks a = 1, 2, 3, 4; (n + 1)/2 = 2.5; d = -1.5, -0.5, 0.5, 1.5.
     * long (d > 0): ids 3, 4 at .5/2 = .25 and 1.5/2 = .75; short (d < 0): ids 1, 2 at 1.5/2 = .75 and .5/2 = .25.
     * long = .25*.03 + .75*.04 = .0375; short = .75*.01 + .25*.02 = .0125; spread = .025.
     */
    @Test
    void rankWeightedHoldsEverySecurityByItsCentredRank() {
        int[] ids = {1, 2, 3, 4};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.of("2024-01-31", ids, nan(4), nan(4), new double[] {1, 2, 3, 4}),
                Sections.of("2024-02-01", ids, new double[] {.01, .02, .03, .04}, nan(4), nan(4))));
        FactorDefinition def = FactorDefinition.builder(Method.RANK_WEIGHTED).panel("p").signal("signal").build();
        FactorObservation o = FactorEngine.build(def, panel, null, null).observations().get(0);
        assertEquals(.0375, o.longLeg(), EXACT);
        assertEquals(.0125, o.shortLeg(), EXACT);
        assertEquals(.025, o.spread(), EXACT);
    }

    /*
     * Ties share their mean rank: signals 5, 5, 9 -> a = 1.5, 1.5, 3; centre 2; d = -.5, -.5, 1.
     * long: id 3 alone (weight 1); short: ids 1 and 2 at .5 each. Returns .02 .04 .10 -> spread .10 - .03 = .07.
     */
    @Test
    void rankWeightedTiesShareTheirMeanRank() {
        int[] ids = {1, 2, 3};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.of("2024-01-31", ids, nan(3), nan(3), new double[] {5, 5, 9}),
                Sections.of("2024-02-01", ids, new double[] {.02, .04, .10}, nan(3), nan(3))));
        FactorDefinition def = FactorDefinition.builder(Method.RANK_WEIGHTED).panel("p").signal("signal").build();
        assertEquals(.07, FactorEngine.build(def, panel, null, null).observations().get(0).spread(), EXACT);
    }

    /*
     * Dependent double sort, two control buckets on the control signal (market_cap here), two signal buckets inside.
     *   id      1    2    3    4    5    6    7    8
     *   cap     1    2    3    4    5    6    7    8      median (type 7) 4.5: small = ids 1-4, big = ids 5-8
     *   signal  4    3    2    1    1    2    3    4
     *   inside small: median signal 2.5 -> low ids 3, 4; high ids 1, 2. inside big: low ids 5, 6; high ids 7, 8.
     *   return  .01  .03  .05  .07  .02  .04  .06  .08   (equal weights)
     * high = (mean(.01,.03) + mean(.06,.08))/2 = (.02 + .07)/2 = .045; low = (mean(.05,.07) + mean(.02,.04))/2 = .045.
     */
    @Test
    void dependentDoubleSortAveragesTheControlBuckets() {
        int[] ids = {1, 2, 3, 4, 5, 6, 7, 8};
        double[] caps = {1, 2, 3, 4, 5, 6, 7, 8};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.of("2024-01-31", ids, nan(8), caps, new double[] {4, 3, 2, 1, 1, 2, 3, 4}),
                Sections.of("2024-02-01", ids, new double[] {.01, .03, .05, .07, .02, .04, .06, .08}, caps, nan(8))));
        FactorDefinition def = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(2)
                .control(new FactorDefinition.Control(Recipe.column("market_cap"), 2)).build();
        FactorObservation o = FactorEngine.build(def, panel, null, null).observations().get(0);
        assertEquals(.045, o.longLeg(), EXACT);
        assertEquals(.045, o.shortLeg(), EXACT);
        assertEquals(0.0, o.spread(), EXACT);
    }

    /*
     * Breakpoints within groups. Groups A (ids 1-3, signals 1 2 3) and B (ids 4-6, signals 10 20 30), three buckets.
     * In A: h = 2/3 -> 1 + 2/3 = 1.667, h = 4/3 -> 2 + 1/3 = 2.333: low id 1, high id 3. In B likewise low id 4, high 6.
     * Pooled, equal weights, returns .01 .02 .03 .04 .05 .06: high = (.03 + .06)/2 = .045, low = (.01 + .04)/2 = .025.
     * One sort over all six would cut at 2.667 and 13.33: low ids 1, 2, high ids 5, 6, spread .055 - .015 = .04.
     * A seventh security with no group label is not eligible.
     */
    @Test
    void withinGroupBreakpointsPoolEachGroupsBuckets() {
        int[] ids = {1, 2, 3, 4, 5, 6, 7};
        String[] groups = {"A", "A", "A", "B", "B", "B", null};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.withLabels("2024-01-31", ids, nan(7), nan(7), new double[] {1, 2, 3, 10, 20, 30, 99}, groups),
                Sections.withLabels("2024-02-01", ids, new double[] {.01, .02, .03, .04, .05, .06, .5}, nan(7), nan(7), groups)));
        FactorDefinition within = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3).within("group").build();
        FactorObservation o = FactorEngine.build(within, panel, null, null).observations().get(0);
        assertEquals(.045, o.longLeg(), EXACT);
        assertEquals(.025, o.shortLeg(), EXACT);
        assertEquals(.02, o.spread(), EXACT);
    }
}
