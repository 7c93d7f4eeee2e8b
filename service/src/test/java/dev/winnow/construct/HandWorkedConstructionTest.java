package dev.winnow.construct;

import static dev.winnow.construct.Sections.nan;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.construct.FactorDefinition.Rebalance;
import dev.winnow.construct.FactorDefinition.Weighting;
import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Small examples worked by hand from the construction rules (the arithmetic is in the comments). Breakpoints use
 * Hyndman and Fan (1996) definition 7: h = (n - 1) p, Q = x[floor h] + (h - floor h)(x[floor h + 1] - x[floor h]).
 */
class HandWorkedConstructionTest {
    private static final double EXACT = 1e-15;

    /*
     * Six securities, three buckets, formation on 2024-01-31 held over 2024-02-01.
     *   id     1     2     3     4     5     6
     *   signal 2     6     1     4     2     5
     *   cap    100   200   300   50    100   600
     *   return .01   .04  -.02   0     .03   .02
     * sorted signals 1 2 2 4 5 6 (n = 6)
     *   p = 1/3: h = 5/3, Q = x[1] + (2/3)(x[2] - x[1]) = 2 + 0 = 2   <- ids 1 and 5 sit exactly on it: lower bucket
     *   p = 2/3: h = 10/3, Q = x[3] + (1/3)(x[4] - x[3]) = 4 + 1/3
     * bucket 1 (<= 2): ids 3, 1, 5; bucket 2: id 4; bucket 3 (> 4.33): ids 2, 6.
     * equal weights: low = (.01 - .02 + .03)/3 = .02/3; high = (.04 + .02)/2 = .03; spread = .03 - .02/3.
     * cap weights: low = (100*.01 + 300*(-.02) + 100*.03)/500 = -.004; high = (200*.04 + 600*.02)/800 = .025.
     * (Had ties gone up, bucket 1 would be id 3 alone and the equal-weight spread .03 + .02 = .05.)
     */
    private static InMemoryPanel sixSecurities() {
        int[] ids = {1, 2, 3, 4, 5, 6};
        double[] caps = {100, 200, 300, 50, 100, 600};
        return new InMemoryPanel(List.of(
                Sections.of("2024-01-31", ids, nan(6), caps, new double[] {2, 6, 1, 4, 2, 5}),
                Sections.of("2024-02-01", ids, new double[] {.01, .04, -.02, 0, .03, .02}, caps, nan(6))));
    }

    @Test
    void sortWithATieAtABreakpointEqualWeights() {
        FactorDefinition def = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3).build();
        BuildResult result = FactorEngine.build(def, sixSecurities(), null, null);
        FactorObservation o = single(result);
        assertEquals(LocalDate.parse("2024-02-01"), o.date());
        assertEquals(.03, o.longLeg(), EXACT);
        assertEquals(.02 / 3, o.shortLeg(), EXACT);
        assertEquals(.03 - .02 / 3, o.spread(), EXACT);
        // first formation from an empty book: one unit into each leg
        assertEquals(List.of(new Formation(LocalDate.parse("2024-01-31"), 2.0)), result.formations());
    }

    @Test
    void sortCapWeightedLowMinusHighWithCosts() {
        FactorDefinition def = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3)
                .weighting(Weighting.CAP).direction(FactorDefinition.Direction.LOW_MINUS_HIGH).costBps(50.0).build();
        FactorObservation o = single(FactorEngine.build(def, sixSecurities(), null, null));
        assertEquals(-.004, o.longLeg(), EXACT);
        assertEquals(.025, o.shortLeg(), EXACT);
        assertEquals(-.029, o.spread(), EXACT);
        // net = gross - 50 / 10,000 * turnover 2
        assertEquals(-.029 - .01, o.net(), EXACT);
    }

    /*
     * Fama-French 2x3 on ten securities, id i has cap 10 i and return i/100; signals 0.1 .. 1.0 in the order
     *   id     1   2   3   4   5   6   7   8   9   10
     *   signal .1  .5  .9  .3  .7  .2  .8  .4  .6  1.0
     * size median (n = 10): h = 4.5, Q = 50 + .5 * 10 = 55 -> small ids 1..5, big 6..10
     * signal 30th: h = 2.7, Q = .3 + .7 * .1 = .37; 70th: h = 6.3, Q = .7 + .3 * .1 = .73
     * low (<= .37): ids 1, 6, 4; high (> .73): ids 7, 3, 10; neutral: 8, 2, 9, 5
     * SL {1, 4} = (10*.01 + 40*.04)/50 = .034      SN {2, 5} = (20*.02 + 50*.05)/70 = 2.9/70     SH {3} = .03
     * BL {6} = .06                                 BN {8, 9} = (80*.08 + 90*.09)/170 = 14.5/170  BH {7, 10} = 14.9/170
     */
    private static InMemoryPanel tenSecurities() {
        int[] ids = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
        double[] caps = {10, 20, 30, 40, 50, 60, 70, 80, 90, 100};
        double[] returns = {.01, .02, .03, .04, .05, .06, .07, .08, .09, .10};
        return new InMemoryPanel(List.of(
                Sections.of("2024-03-28", ids, nan(10), caps, new double[] {.1, .5, .9, .3, .7, .2, .8, .4, .6, 1.0}),
                Sections.of("2024-04-01", ids, returns, caps, nan(10))));
    }

    @Test
    void sizeSortSignalOutput() {
        FactorDefinition def = FactorDefinition.builder(Method.SIZE_SORT).panel("p").signal("signal").build();
        BuildResult result = FactorEngine.build(def, tenSecurities(), null, null);
        FactorObservation o = single(result);
        double sh = .03;
        double bh = 14.9 / 170;
        double sl = .034;
        double bl = .06;
        assertEquals((sh + bh) / 2, o.longLeg(), EXACT); // = 1/17
        assertEquals((sl + bl) / 2, o.shortLeg(), EXACT);
        assertEquals((sh + bh) / 2 - (sl + bl) / 2, o.spread(), EXACT);
        assertEquals(2.0, result.formations().get(0).turnover(), EXACT);
    }

    @Test
    void sizeSortSizeOutput() {
        FactorDefinition def = FactorDefinition.builder(Method.SIZE_SORT).panel("p").signal("signal")
                .output(Output.SIZE).build();
        FactorObservation o = single(FactorEngine.build(def, tenSecurities(), null, null));
        double small = (.034 + 2.9 / 70 + .03) / 3;
        double big = (.06 + 14.5 / 170 + 14.9 / 170) / 3;
        assertEquals(small, o.longLeg(), EXACT);
        assertEquals(big, o.shortLeg(), EXACT);
        assertEquals(small - big, o.spread(), EXACT);
    }

    /*
     * Drift, a member losing its return, monthly rebalancing and costs. Daily grid
     *   01-30, 01-31, 02-01, 02-02, 02-29, 03-01; rebalance points (monthly): 01-31 and 02-29.
     * Two buckets, equal weights, 20 bps. Formation on 01-31 (signals .1 .2 .8 .9): median = .2 + .5 * .6 = .5,
     * low {1, 2}, high {3, 4}, 1/2 each; held 02-01 .. 02-29.
     *   02-01 returns  .10   0    .02  -.02 : low .05, high 0, spread -.05, net -.05 - .002 * 2 = -.054
     *         values   .55   .5   .51  .49
     *   02-02 returns  0     .10  NaN  .01  : id 3 leaves; low = .05/1.05, high = .01
     *         values   .55   .55  -    .4949
     *   02-29 returns  .02  -.02  .05  .03  : low (.55*.02 - .55*.02)/1.1 = 0, high .03 (id 3 stays out)
     *         values   .561  .539 -    .509747
     * Formation on 02-29 (signals .9 .1 .8 .2): low {2, 4}, high {1, 3}.
     *   turnover long (high): old {4: 1}, new {1: .5, 3: .5} -> .5 + .5 + 1 = 2
     *            short (low): old {1: .561/1.1 = .51, 2: .49}, new {2: .5, 4: .5} -> .51 + .01 + .5 = 1.02
     *   03-01 returns .01 .02 .03 .04: high .02, low .03, spread -.01, net -.01 - .002 * 3.02 = -.01604
     */
    @Test
    void driftLeavingMemberTurnoverAndCostsOverMonthlyHoldings() {
        int[] ids = {1, 2, 3, 4};
        double[] caps = {1, 1, 1, 1};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.of("2024-01-30", ids, nan(4), caps, new double[] {.9, .8, .2, .1}),
                Sections.of("2024-01-31", ids, nan(4), caps, new double[] {.1, .2, .8, .9}),
                Sections.of("2024-02-01", ids, new double[] {.10, 0, .02, -.02}, caps, nan(4)),
                Sections.of("2024-02-02", ids, new double[] {0, .10, Double.NaN, .01}, caps, nan(4)),
                Sections.of("2024-02-29", ids, new double[] {.02, -.02, .05, .03}, caps, new double[] {.9, .1, .8, .2}),
                Sections.of("2024-03-01", ids, new double[] {.01, .02, .03, .04}, caps, nan(4))));
        FactorDefinition def = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(2)
                .rebalance(Rebalance.MONTHLY).costBps(20.0).build();
        BuildResult result = FactorEngine.build(def, panel, null, null);

        assertEquals(List.of(LocalDate.parse("2024-01-31"), LocalDate.parse("2024-02-29")),
                result.formations().stream().map(Formation::date).toList());
        assertEquals(2.0, result.formations().get(0).turnover(), EXACT);
        assertEquals(3.02, result.formations().get(1).turnover(), 1e-14);
        List<FactorObservation> obs = result.observations();
        assertEquals(4, obs.size());
        assertEquals(-.05, obs.get(0).spread(), EXACT);
        assertEquals(-.054, obs.get(0).net(), EXACT);
        assertEquals(.05 / 1.05, obs.get(1).shortLeg(), EXACT);
        assertEquals(.01, obs.get(1).longLeg(), EXACT);
        assertEquals(obs.get(1).spread(), obs.get(1).net(), 0.0, "no cost after a holding's first period");
        assertEquals(0.0, obs.get(2).shortLeg(), EXACT);
        assertEquals(.03, obs.get(2).longLeg(), EXACT);
        assertEquals(-.01, obs.get(3).spread(), EXACT);
        assertEquals(-.01 - .002 * 3.02, obs.get(3).net(), 1e-14);
        assertEquals(0, result.periodsWithoutReturn());
    }

    /*
     * Market: caps 100 and 300 at formation, returns .01 and .03 -> (1 + 9)/400 = .025; minus risk-free .001 = .024.
     * The second period has no risk-free return, so no market return (counted).
     */
    @Test
    void marketMinusRiskFree() {
        int[] ids = {7, 9};
        double[] caps = {100, 300};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.of("2024-05-02", ids, nan(2), caps, nan(2)),
                Sections.of("2024-05-03", ids, new double[] {.01, .03}, caps, nan(2)),
                Sections.of("2024-05-06", ids, new double[] {.01, .03}, caps, nan(2))));
        ReturnSeries rf = new ReturnSeries(new LocalDate[] {LocalDate.parse("2024-05-03")}, new double[] {.001});
        FactorDefinition def = FactorDefinition.builder(Method.MARKET).panel("p").riskFree("cash").build();
        BuildResult result = FactorEngine.build(def, panel, rf, null);
        FactorObservation o = single(result);
        assertEquals(.025, o.longLeg(), EXACT);
        assertTrue(Double.isNaN(o.shortLeg()));
        assertEquals(.024, o.spread(), EXACT);
        assertEquals(1, result.periodsWithoutReturn());
        assertEquals(1.0, result.formations().get(0).turnover(), 0.0, "market: one unit into its one leg");
    }

    /*
     * Breakpoint subset and size half on the six securities, with labels (group) x y x y x y:
     * subset group = x: signals of ids 1, 3, 5 = 2, 1, 2 -> sorted 1 2 2; p = 1/3: h = 2/3, Q = 1 + (2/3)(1) = 5/3;
     * p = 2/3: h = 4/3, Q = 2 + 0 = 2. All six assigned: bucket 1 (<= 5/3): id 3; bucket 3 (> 2): ids 2, 4, 6.
     * equal: low = -.02, high = (.04 + 0 + .02)/3 = .02, spread .04.
     * Size half BIG: median cap of 100 200 300 50 100 600 = 100 + .5 * 100 = 150 -> ids 2, 3, 6 (caps > 150);
     * then breakpoints on signals 6 1 5 -> 1 5 6: Q(1/3) = 1 + (2/3)*4 = 11/3, Q(2/3) = 5 + (1/3)*1 = 16/3;
     * low id 3 (-.02), high id 2 (.04) -> spread .06.
     */
    @Test
    void breakpointSubsetAndSizeHalf() {
        int[] ids = {1, 2, 3, 4, 5, 6};
        double[] caps = {100, 200, 300, 50, 100, 600};
        String[] group = {"x", "y", "x", "y", "x", "y"};
        InMemoryPanel panel = new InMemoryPanel(List.of(
                Sections.withLabels("2024-01-31", ids, nan(6), caps, new double[] {2, 6, 1, 4, 2, 5}, group),
                Sections.withLabels("2024-02-01", ids, new double[] {.01, .04, -.02, 0, .03, .02}, caps, nan(6), group)));
        FactorDefinition subset = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3)
                .breakpoints(new LabelEquals("group", "x")).build();
        assertEquals(.04, single(FactorEngine.build(subset, panel, null, null)).spread(), EXACT);

        FactorDefinition big = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3)
                .universe(Universe.ALL.withSizeHalf(SizeHalf.BIG)).build();
        assertEquals(.06, single(FactorEngine.build(big, panel, null, null)).spread(), EXACT);

        // an empty breakpoint subset is a formation with empty portfolios: no return for its holding period
        FactorDefinition none = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3)
                .breakpoints(new LabelEquals("group", "z")).build();
        BuildResult empty = FactorEngine.build(none, panel, null, null);
        assertTrue(empty.observations().isEmpty());
        assertEquals(1, empty.periodsWithoutReturn());
        assertEquals(0.0, empty.formations().get(0).turnover(), 0.0);
    }

    private static FactorObservation single(BuildResult result) {
        assertEquals(1, result.observations().size(), "observations: " + result.observations());
        return result.observations().get(0);
    }
}
