package dev.winnow.charts;

import java.time.DayOfWeek;
import java.time.LocalDate;
import java.time.temporal.TemporalAdjusters;
import java.util.ArrayList;
import java.util.List;

/**
 * Dated ticks at calendar steps: days, Mondays, month starts (every 1, 3 or 6 months) or the first of January every
 * 1, 2, 5, 10, 20, 50 or 100 years, whichever is the finest step giving at most {@code maxTicks} ticks in the range.
 * Each tick is the first day of its calendar period, so a tick labelled 2010 sits on 2010-01-01.
 */
final class TimeAxis {
    enum Unit { DAY, WEEK, MONTH, YEAR }

    /** A calendar step: {@code count} units. */
    record Step(Unit unit, int count) {
    }

    record Tick(LocalDate date, String label) {
    }

    static final List<Step> STEPS = List.of(new Step(Unit.DAY, 1), new Step(Unit.WEEK, 1), new Step(Unit.MONTH, 1),
            new Step(Unit.MONTH, 3), new Step(Unit.MONTH, 6), new Step(Unit.YEAR, 1), new Step(Unit.YEAR, 2),
            new Step(Unit.YEAR, 5), new Step(Unit.YEAR, 10), new Step(Unit.YEAR, 20), new Step(Unit.YEAR, 50),
            new Step(Unit.YEAR, 100));

    private TimeAxis() {
    }

    /** The ticks from {@code from} to {@code to} (inclusive) at the finest step with at most maxTicks of them. */
    static List<Tick> ticks(LocalDate from, LocalDate to, int maxTicks) {
        if (from.isAfter(to)) {
            throw new IllegalArgumentException("from " + from + " is after to " + to);
        }
        if (maxTicks < 2) {
            throw new IllegalArgumentException("maxTicks must be at least 2, got " + maxTicks);
        }
        for (Step step : STEPS) {
            List<Tick> ticks = ticks(from, to, step, maxTicks);
            if (ticks != null) {
                return ticks;
            }
        }
        throw new IllegalArgumentException("a range of " + from + " to " + to + " needs more than " + maxTicks + " century ticks");
    }

    /** The ticks at one step, or null when there would be more than maxTicks. */
    static List<Tick> ticks(LocalDate from, LocalDate to, Step step, int maxTicks) {
        List<Tick> out = new ArrayList<>();
        for (LocalDate d = first(from, step); !d.isAfter(to); d = next(d, step)) {
            if (out.size() == maxTicks) {
                return null;
            }
            out.add(new Tick(d, label(d, step)));
        }
        return out;
    }

    private static LocalDate first(LocalDate from, Step step) {
        return switch (step.unit()) {
            case DAY -> from;
            case WEEK -> from.with(TemporalAdjusters.nextOrSame(DayOfWeek.MONDAY));
            case MONTH -> {
                LocalDate start = from.withDayOfMonth(1);
                int month0 = start.getMonthValue() - 1;
                int aligned = (month0 + step.count() - 1) / step.count() * step.count();
                LocalDate d = start.withMonth(1).plusMonths(aligned);
                yield d.isBefore(from) ? d.plusMonths(step.count()) : d;
            }
            case YEAR -> {
                int year = Math.floorDiv(from.getYear() + step.count() - 1, step.count()) * step.count();
                LocalDate d = LocalDate.of(year, 1, 1);
                yield d.isBefore(from) ? d.plusYears(step.count()) : d;
            }
        };
    }

    private static LocalDate next(LocalDate d, Step step) {
        return switch (step.unit()) {
            case DAY -> d.plusDays(step.count());
            case WEEK -> d.plusWeeks(step.count());
            case MONTH -> d.plusMonths(step.count());
            case YEAR -> d.plusYears(step.count());
        };
    }

    private static String label(LocalDate d, Step step) {
        return switch (step.unit()) {
            case DAY, WEEK -> d.toString();
            case MONTH -> d.toString().substring(0, 7);
            case YEAR -> String.valueOf(d.getYear());
        };
    }
}
