package dev.winnow.api;

import dev.winnow.research.SeriesNames;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The series a correlation request names: {@code factors=a,b,...} (current versions' spreads, or
 * {@code <factor>:<portfolio>} for a stored portfolio, resolved by {@link SeriesNames}), {@code method},
 * {@code from}/{@code to} and {@code frequency}. The correlation endpoints and the correlation chart read their
 * input through here, so they agree on what is correlated.
 *
 * @param versions the named factors' current versions, in the order named
 * @param series   their spreads with the range and frequency applied, none empty
 */
record CorrelationRequest(List<String> names, Correlations.Method method, List<FactorVersionRecord> versions, List<ReturnSeries> series) {
    static final int MAX_FACTORS = 200;

    static CorrelationRequest of(Context ctx, FactorStore factors, int minFactors) {
        List<String> names = factorList(ctx, minFactors);
        Correlations.Method method = methodParam(ctx);
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Frequency target = SeriesRequest.frequencyParam(ctx);
        List<FactorVersionRecord> versions = new ArrayList<>();
        List<ReturnSeries> series = new ArrayList<>();
        SeriesNames seriesNames = new SeriesNames(factors);
        for (String name : names) {
            SeriesNames.Resolved named = seriesNames.resolve(name, "factors");
            FactorVersionRecord v = named.version();
            SeriesRequest.Resolved r = SeriesRequest.convert(name, named.series(), from, to, target);
            if (r.series().size() == 0) {
                throw ApiProblem.badRequest("Factor '" + name + "' has no observations in the requested range.");
            }
            versions.add(v);
            series.add(r.series());
        }
        return new CorrelationRequest(names, method, versions, series);
    }

    String methodName() {
        return method.name().toLowerCase(Locale.ROOT);
    }

    /** Every input version and its data version, for an ETag that changes when any of them changes. */
    String dataKey() {
        StringBuilder key = new StringBuilder("correlations");
        versions.forEach(v -> key.append(';').append(v.factorId()).append('.').append(v.version()).append('.').append(v.dataVersion()));
        return key.toString();
    }

    /** A pair without a single common date is a request that cannot be answered (400), not a null in the matrix. */
    void rejectEmptyOverlap(int[][] observations) {
        for (int i = 0; i < names.size(); i++) {
            for (int j = i + 1; j < names.size(); j++) {
                if (observations[i][j] == 0) {
                    throw ApiProblem.badRequest("Factors '" + names.get(i) + "' and '" + names.get(j) + "' have no dates in common"
                            + " in the requested range; leave one of them out or widen 'from'/'to'.");
                }
            }
        }
    }

    private static List<String> factorList(Context ctx, int min) {
        List<String> names = Requests.listParam(ctx, "factors");
        if (names == null || names.size() < min) {
            throw ApiProblem.badRequest("Query parameter 'factors' must list at least " + min + " factor names separated by commas.");
        }
        if (names.size() > MAX_FACTORS) {
            throw ApiProblem.badRequest("At most " + MAX_FACTORS + " factors per request; got " + names.size() + ".");
        }
        if (names.stream().distinct().count() != names.size()) {
            throw ApiProblem.badRequest("Query parameter 'factors' names a factor twice; list each once.");
        }
        return names;
    }

    private static Correlations.Method methodParam(Context ctx) {
        String m = Requests.choiceParam(ctx, "method", List.of("pearson", "spearman"), "pearson");
        return m.equals("spearman") ? Correlations.Method.SPEARMAN : Correlations.Method.PEARSON;
    }
}
