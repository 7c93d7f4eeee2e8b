package dev.winnow.stats;

import java.time.LocalDate;
import java.util.List;

/**
 * Turnover and the break-even trading cost of a factor over a stretch of its series.
 *
 * @param averageAnnualTurnover sum of turnover over the formations that earn in the stretch / years covered
 * @param breakEvenCostBps      cost in basis points per unit of turnover at which the mean net return is zero
 */
public record TradingCosts(double averageAnnualTurnover, double breakEvenCostBps) {

    /**
     * Costs of the stretch {@code first..last} of a gross (before-cost) series {@code all}, given the turnover of each
     * formation (date and amount, the sum of absolute weight changes over both legs).
     * <ul>
     *   <li>A formation earns in the stretch when it comes before {@code last} and on or after the last observation
     *       of {@code all} before {@code first} (any formation, when there is none).</li>
     *   <li>Years covered = observations in the stretch / periods per year of {@code all}'s frequency
     *       ({@link Frequency#fromDates}); average annual turnover = sum of turnover / years.</li>
     *   <li>Costs are charged once per formation, so mean net = mean gross - c/10,000 x (sum of turnover / n), and
     *       the break-even cost c* = 10,000 x sum of gross returns / sum of turnover (NaN without turnover).</li>
     * </ul>
     */
    public static TradingCosts of(ReturnSeries all, List<LocalDate> formationDates, double[] turnover,
                                  LocalDate first, LocalDate last) {
        AnalyticsChecks.notNull(all, "all");
        AnalyticsChecks.notNull(formationDates, "formationDates");
        AnalyticsChecks.finiteValues(turnover, "turnover");
        AnalyticsChecks.notNull(first, "first");
        AnalyticsChecks.notNull(last, "last");
        if (formationDates.size() != turnover.length) {
            throw new IllegalArgumentException("formationDates and turnover must pair up: " + formationDates.size()
                    + " dates and " + turnover.length + " amounts");
        }
        ReturnSeries gross = all.between(first, last);
        ReturnSeries before = all.between(null, first.minusDays(1));
        LocalDate earliestFormation = before.size() == 0 ? LocalDate.MIN : before.date(before.size() - 1);
        double totalTurnover = 0.0;
        for (int i = 0; i < turnover.length; i++) {
            LocalDate formed = formationDates.get(i);
            if (!formed.isBefore(earliestFormation) && formed.isBefore(last)) {
                totalTurnover += turnover[i];
            }
        }
        double sumGross = 0.0;
        for (int t = 0; t < gross.size(); t++) {
            sumGross += gross.value(t);
        }
        double years = gross.size() / (double) Frequency.fromDates(List.of(all.dates())).periodsPerYear();
        return new TradingCosts(years > 0 ? totalTurnover / years : Double.NaN,
                totalTurnover > 0 ? 10_000 * sumGross / totalTurnover : Double.NaN);
    }
}
