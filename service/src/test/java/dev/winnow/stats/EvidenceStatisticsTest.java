package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Spanning regression, stability and the theme composite against statsmodels (OLS, HAC with use_correction=False)
 * and pandas (inner-join means): service/src/test/scripts/evidence_fixture.py, fixture fixtures/evidence.json.
 */
class EvidenceStatisticsTest {
    private static final double TOLERANCE = 1e-10;
    private static final JsonNode FIXTURE = FixtureFiles.read("evidence.json");

    @Test
    void spanningRegressionMatchesStatsmodelsHac() {
        JsonNode f = FIXTURE.get("spanning");
        List<ReturnSeries> others = new ArrayList<>();
        for (JsonNode s : f.get("others")) {
            others.add(FixtureFiles.series(s.get("dates"), s.get("returns")));
        }
        ReturnSeries factor = FixtureFiles.series(f.get("factor").get("dates"), f.get("factor").get("returns"));
        SpanningRegression r = SpanningRegression.of(factor, others);
        assertEquals(f.get("n").asInt(), r.n());
        assertEquals(f.get("nw_lags").asInt(), r.nwLags());
        assertEquals(f.get("alpha").asDouble(), r.alpha(), 1e-12);
        assertEquals(f.get("alpha_nw_t").asDouble(), r.alphaNwTStat(), TOLERANCE);
        assertEquals(f.get("r_squared").asDouble(), r.rSquared(), TOLERANCE);
        double[] betas = FixtureFiles.doubles(f.get("betas"));
        for (int j = 0; j < betas.length; j++) {
            assertEquals(betas[j], r.betas()[j], TOLERANCE, "beta " + j);
        }
    }

    @Test
    void spanningWithoutOthersOrDegreesOfFreedomIsUndefined() {
        ReturnSeries a = series(0.01, 0.02, -0.01, 0.03);
        assertTrue(Double.isNaN(SpanningRegression.of(a, List.of()).alphaNwTStat()));
        // three common dates and two regressors leave no residual degree of freedom: n <= k + 1
        SpanningRegression tight = SpanningRegression.of(a.between(null, LocalDate.of(2020, 3, 31)), List.of(a, a));
        assertEquals(3, tight.n());
        assertTrue(Double.isNaN(tight.alpha()));
    }

    @Test
    void stabilityMatchesStatsmodelsOnHalvesDecadesRollingWindowsAndDiscoverySplit() {
        JsonNode f = FIXTURE.get("stability");
        ReturnSeries monthly = FixtureFiles.series(f.get("dates"), f.get("returns"));
        LocalDate foundOn = LocalDate.parse(f.get("found_on").asText());
        StabilityReport report = StabilityReport.of(monthly, 60, 2.0, foundOn);
        assertPeriods(f.get("halves"), report.halves());
        assertPeriods(f.get("decades"), report.decades());
        assertEquals(f.get("share_above_2").asDouble(), report.shareAbove(), 1e-15);
        assertPeriod(f.get("before"), report.foundOn().before());
        assertPeriod(f.get("after"), report.foundOn().after());
        assertEquals(f.get("ratio").asDouble(), report.foundOn().ratio(), TOLERANCE);
    }

    @Test
    void stabilityOfAShortSeriesHasNoRollingShare() {
        StabilityReport report = StabilityReport.of(series(0.01, 0.02, 0.03), 60, 2.0, null);
        assertTrue(Double.isNaN(report.shareAbove()));
        assertEquals(2, report.halves().get(0).n(), "the first half has the extra month");
        assertEquals(null, report.foundOn());
    }

    @Test
    void compositeMatchesPandasInnerJoinMean() {
        JsonNode f = FIXTURE.get("composite");
        List<ReturnSeries> members = new ArrayList<>();
        for (JsonNode s : f.get("series")) {
            members.add(FixtureFiles.series(s.get("dates"), s.get("returns")));
        }
        ReturnSeries composite = EqualWeightComposite.of(members);
        ReturnSeries expected = FixtureFiles.series(f.get("dates"), f.get("returns"));
        assertEquals(expected.size(), composite.size());
        for (int t = 0; t < expected.size(); t++) {
            assertEquals(expected.date(t), composite.date(t));
            assertEquals(expected.value(t), composite.value(t), 1e-15, "at " + expected.date(t));
        }
        assertEquals(f.get("nw_t").asDouble(), PeriodStatistics.of(composite).nwTStat(), TOLERANCE);
    }

    @Test
    void monthlyBasisCompoundsWeeklyDatesByMonthEndAndExcludesAnnual() {
        // Compounding by hand: five Fridays in January 2020, then 2020-02-07 in February.
        LocalDate[] fridays = new LocalDate[6];
        for (int i = 0; i < 6; i++) {
            fridays[i] = LocalDate.of(2020, 1, 3).plusWeeks(i);
        }
        MonthlyBasis basis = MonthlyBasis.of(new ReturnSeries(fridays, new double[] {0.10, -0.05, 0.0, 0.0, 0.0, 0.02}));
        assertEquals(Frequency.WEEKLY, basis.nativeFrequency());
        assertEquals(2, basis.monthly().size());
        assertEquals(1.10 * 0.95 - 1, basis.monthly().value(0), 1e-15);
        assertEquals(LocalDate.of(2020, 1, 31), basis.monthly().date(0));
        assertEquals(0.02, basis.monthly().value(1), 0.0);
        assertEquals(LocalDate.of(2020, 2, 29), basis.monthly().date(1), "months are dated by their last calendar day");
        ReturnSeries annual = new ReturnSeries(new LocalDate[] {LocalDate.of(2020, 12, 31), LocalDate.of(2021, 12, 31),
                LocalDate.of(2022, 12, 30)}, new double[] {0.1, 0.2, 0.3});
        assertTrue(MonthlyBasis.of(annual).excluded());
        assertEquals(0, MonthlyBasis.of(annual).monthly().size());
    }

    @Test
    void tradingCostsWorkedByHand() {
        // Gross returns Jan..Apr 2020: 1%, 2%, -0.5%, 1.5%. Formations at the end of Dec, Jan, Feb, Mar, Apr with
        // turnover 2 (from an empty book), 0.5, 0.3, 0.4, 0.6.
        // Whole series: the formations before the last date earn in it: 2 + 0.5 + 0.3 + 0.4 = 3.2 over 4/12 years,
        // 9.6 a year; break-even = 10,000 x 0.04 / 3.2 = 125 bps.
        // Feb..Apr: formations from the last date before Feb (Jan 31) on: 0.5 + 0.3 + 0.4 = 1.2 over 3/12 years,
        // 4.8 a year; gross sum 0.03, break-even = 10,000 x 0.03 / 1.2 = 250 bps.
        ReturnSeries gross = series(0.01, 0.02, -0.005, 0.015);
        List<LocalDate> formed = List.of(LocalDate.of(2019, 12, 31), LocalDate.of(2020, 1, 31), LocalDate.of(2020, 2, 29),
                LocalDate.of(2020, 3, 31), LocalDate.of(2020, 4, 30));
        double[] turnover = {2.0, 0.5, 0.3, 0.4, 0.6};
        TradingCosts whole = TradingCosts.of(gross, formed, turnover, gross.date(0), gross.date(3));
        assertEquals(9.6, whole.averageAnnualTurnover(), 1e-12);
        assertEquals(125.0, whole.breakEvenCostBps(), 1e-9);
        TradingCosts late = TradingCosts.of(gross, formed, turnover, gross.date(1), gross.date(3));
        assertEquals(4.8, late.averageAnnualTurnover(), 1e-12);
        assertEquals(250.0, late.breakEvenCostBps(), 1e-9);
    }

    @Test
    void calendarPeriodEndsWorkedFromTheCalendar() {
        // 2021-05-12 is a Wednesday: its ISO week runs Monday 10 to Sunday 16 May; Q2 ends 30 June; 2024 is a leap year.
        LocalDate wednesday = LocalDate.of(2021, 5, 12);
        assertEquals(wednesday, CalendarPeriods.periodEnd(wednesday, Frequency.DAILY));
        assertEquals(LocalDate.of(2021, 5, 16), CalendarPeriods.periodEnd(wednesday, Frequency.WEEKLY));
        assertEquals(LocalDate.of(2021, 6, 30), CalendarPeriods.periodEnd(wednesday, Frequency.QUARTERLY));
        assertEquals(LocalDate.of(2021, 12, 31), CalendarPeriods.periodEnd(wednesday, Frequency.ANNUAL));
        assertEquals(LocalDate.of(2024, 2, 29), CalendarPeriods.periodEnd(LocalDate.of(2024, 2, 10), Frequency.MONTHLY));
        ReturnSeries twoInMay = new ReturnSeries(new LocalDate[] {wednesday, wednesday.plusDays(1)}, new double[] {0.01, 0.02});
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> CalendarPeriods.labelledByPeriodEnd(twoInMay, Frequency.MONTHLY));
        assertTrue(e.getMessage().contains("compound"), e.getMessage());
    }

    private static void assertPeriods(JsonNode expected, List<PeriodStatistics> actual) {
        assertEquals(expected.size(), actual.size());
        for (int i = 0; i < expected.size(); i++) {
            assertPeriod(expected.get(i), actual.get(i));
        }
    }

    private static void assertPeriod(JsonNode expected, PeriodStatistics actual) {
        String where = expected.get("from").asText() + ".." + expected.get("to").asText();
        assertEquals(LocalDate.parse(expected.get("from").asText()), actual.from(), where);
        assertEquals(LocalDate.parse(expected.get("to").asText()), actual.to(), where);
        assertEquals(expected.get("n").asInt(), actual.n(), where);
        assertEquals(expected.get("mean").asDouble(), actual.mean(), 1e-14, where);
        assertEquals(expected.get("nw_t").asDouble(), actual.nwTStat(), TOLERANCE, where);
    }

    private static ReturnSeries series(double... values) {
        LocalDate[] dates = new LocalDate[values.length];
        for (int i = 0; i < values.length; i++) {
            dates[i] = java.time.YearMonth.of(2020, 1).plusMonths(i).atEndOfMonth();
        }
        return new ReturnSeries(dates, values);
    }
}
