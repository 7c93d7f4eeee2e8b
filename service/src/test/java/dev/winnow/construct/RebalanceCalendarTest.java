package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.FactorDefinition.Rebalance;
import java.time.LocalDate;
import org.junit.jupiter.api.Test;

/** The calendar rule written in the construction rules, checked on hand-picked dates. */
class RebalanceCalendarTest {
    private static boolean point(Rebalance rebalance, Integer month, String date, String next) {
        return new RebalanceCalendar(rebalance, month).isRebalancePoint(LocalDate.parse(date), LocalDate.parse(next));
    }

    @Test
    void monthlyIsTheLastGridDateOfAMonth() {
        assertTrue(point(Rebalance.MONTHLY, null, "2024-01-31", "2024-02-01"));
        assertTrue(point(Rebalance.MONTHLY, null, "2024-03-28", "2024-04-01")); // month's last trading day
        assertFalse(point(Rebalance.MONTHLY, null, "2024-01-30", "2024-01-31"));
        // a gap over whole months still counts once, at the last date before it
        assertTrue(point(Rebalance.MONTHLY, null, "2023-11-15", "2024-02-15"));
    }

    @Test
    void quarterlyAndAnnual() {
        assertTrue(point(Rebalance.QUARTERLY, null, "2024-06-28", "2024-07-01"));
        assertFalse(point(Rebalance.QUARTERLY, null, "2024-05-31", "2024-06-03"));
        assertTrue(point(Rebalance.ANNUAL, 6, "2024-06-28", "2024-07-01"));
        assertFalse(point(Rebalance.ANNUAL, 6, "2024-12-31", "2025-01-02"));
        assertTrue(point(Rebalance.ANNUAL, 12, "2024-12-31", "2025-01-02"));
        // monthly data: each date is its month's last
        assertTrue(point(Rebalance.ANNUAL, 6, "2024-06-30", "2024-07-31"));
    }

    @Test
    void everyPeriod() {
        assertTrue(point(Rebalance.EVERY_PERIOD, null, "2024-01-30", "2024-01-31"));
    }
}
