package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Rebalance;
import java.time.LocalDate;
import java.time.YearMonth;

/**
 * Rebalance points on the period grid. Grid index k (not the last) is a rebalance point when the calendar is
 * EVERY_PERIOD, or when the next grid date falls in a later calendar month than date k and the month of date k
 * belongs to the calendar: MONTHLY every month, QUARTERLY March/June/September/December, ANNUAL the chosen month.
 */
final class RebalanceCalendar {
    private final Rebalance rebalance;
    private final int annualMonth;

    RebalanceCalendar(Rebalance rebalance, Integer annualMonth) {
        this.rebalance = rebalance;
        this.annualMonth = annualMonth == null ? 0 : annualMonth;
    }

    /** Whether the grid date {@code date}, followed on the grid by {@code next}, is a rebalance point. */
    boolean isRebalancePoint(LocalDate date, LocalDate next) {
        if (rebalance == Rebalance.EVERY_PERIOD) {
            return true;
        }
        if (!YearMonth.from(next).isAfter(YearMonth.from(date))) {
            return false;
        }
        int month = date.getMonthValue();
        return switch (rebalance) {
            case MONTHLY -> true;
            case QUARTERLY -> month % 3 == 0;
            case ANNUAL -> month == annualMonth;
            case EVERY_PERIOD -> true;
        };
    }
}
