package dev.winnow.research;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;

/**
 * A factor version's stored portfolios side by side: the buckets of a sort, the six of a size_sort. Each portfolio's
 * series gets the request's range, frequency (compounded as {@link FrequencyConversion#compound}) and form; a date
 * appears when any portfolio has a return on it, NaN where one has none.
 */
public final class FactorPortfolios {
    private final FactorStore factors;

    public FactorPortfolios(FactorStore factors) {
        this.factors = factors;
    }

    /**
     * @param names   portfolio names in the definition's order
     * @param dates   the union of the portfolios' dates
     * @param returns returns[k][t] of portfolio k on dates[t], NaN where it has none
     */
    public record Table(FactorVersionRecord version, Frequency frequency, List<String> names, List<LocalDate> dates,
                        List<double[]> returns) {
    }

    public Table table(FactorVersionRecord v, LocalDate from, LocalDate to, Frequency target, boolean cumulative) {
        List<String> names = SeriesNames.portfolioNames(v);
        if (names.isEmpty()) {
            throw new ConflictException("Factor '" + v.name() + "' is a " + DefinitionJson.wire(v.method()) + " factor and has no portfolios;"
                    + " the methods that have them are sort (its buckets) and size_sort (its six 2x3 portfolios).");
        }
        Map<String, ReturnSeries> stored = factors.portfolios(v);
        List<ReturnSeries> series = new ArrayList<>();
        Frequency nativeFrequency = null;
        for (String name : names) {
            ReturnSeries s = stored.getOrDefault(name, ReturnSeries.empty());
            if (s.size() > 1 && nativeFrequency == null) {
                nativeFrequency = Frequency.fromDates(List.of(s.dates()));
            }
            series.add(s.between(from, to));
        }
        Frequency frequency = nativeFrequency == null ? (target == null ? Frequency.DAILY : target) : nativeFrequency;
        if (target != null && nativeFrequency != null && target != nativeFrequency) {
            if (target.compareTo(nativeFrequency) < 0) {
                throw new InvalidRequestException("Factor '" + v.name() + "' is " + nativeFrequency.wireName()
                        + "; its portfolios cannot be converted to the finer frequency '" + target.wireName() + "'.");
            }
            series.replaceAll(s -> FrequencyConversion.compound(s, target));
            frequency = target;
        }
        if (cumulative) {
            series.replaceAll(FrequencyConversion::cumulative);
        }
        TreeSet<LocalDate> union = new TreeSet<>();
        for (ReturnSeries s : series) {
            union.addAll(Arrays.asList(s.dates()));
        }
        List<LocalDate> dates = List.copyOf(union);
        List<double[]> returns = new ArrayList<>();
        for (ReturnSeries s : series) {
            double[] row = new double[dates.size()];
            Arrays.fill(row, Double.NaN);
            int t = 0;
            for (int i = 0; i < s.size(); i++) {
                while (!dates.get(t).equals(s.date(i))) {
                    t++;
                }
                row[t] = s.value(i);
            }
            returns.add(row);
        }
        return new Table(v, frequency, names, dates, returns);
    }
}
