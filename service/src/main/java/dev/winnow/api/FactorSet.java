package dev.winnow.api;

import dev.winnow.stats.Frequency;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Leg;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.StringJoiner;

/**
 * Several factors read together (the library download, the covariance, portfolio risk): their current versions,
 * resolved from the in-memory catalog, and their series converted to one frequency by the rules of
 * {@link SeriesRequest#load}. Without a target frequency every factor must have the same native frequency.
 */
record FactorSet(List<FactorVersionRecord> versions) {
    static final int MAX_FACTORS = 500;

    /** Each series with the frequency all of them have. */
    record Loaded(List<FactorVersionRecord> versions, List<ReturnSeries> series, Frequency frequency) {
    }

    /**
     * The named factors, each once, in the order given; {@code field} names the parameter in problems. Null or
     * empty names mean every live factor that has been built ({@code status} ready), by name, when
     * {@code defaultAll}; else a problem.
     */
    static FactorSet of(FactorStore factors, List<String> names, String field, boolean defaultAll, int min) {
        if (names == null || names.isEmpty()) {
            if (!defaultAll) {
                throw ApiProblem.badRequest("'" + field + "' must list at least " + min + " factor name(s).");
            }
            List<FactorVersionRecord> live = new ArrayList<>();
            for (FactorVersionRecord v : factors.catalog().listCurrent(false)) {
                if (v.status().equals("ready")) {
                    live.add(v);
                }
            }
            return new FactorSet(limited(live, field));
        }
        if (names.size() < min) {
            throw ApiProblem.badRequest("'" + field + "' must list at least " + min + " factor names; got " + names.size() + ".");
        }
        if (names.stream().distinct().count() != names.size()) {
            throw ApiProblem.badRequest("'" + field + "' names a factor twice; list each once.");
        }
        List<FactorVersionRecord> versions = new ArrayList<>();
        for (String name : names) {
            versions.add(factors.catalog().current(name).orElseThrow(() -> ApiProblem.badRequest("Unknown factor '" + name
                    + "' in '" + field + "'; GET /v1/factors lists them.")));
        }
        return new FactorSet(limited(versions, field));
    }

    private static List<FactorVersionRecord> limited(List<FactorVersionRecord> versions, String field) {
        if (versions.size() > MAX_FACTORS) {
            throw ApiProblem.badRequest("At most " + MAX_FACTORS + " factors per request; '" + field + "' gives " + versions.size()
                    + ". Ask for them in several requests.");
        }
        return List.copyOf(versions);
    }

    List<String> names() {
        return versions.stream().map(FactorVersionRecord::name).toList();
    }

    /** The data key of an answer over these factors: their ids, versions and data versions. */
    String dataKey() {
        return Responses.dataKey(versions);
    }

    /**
     * Every factor's series of {@code leg} between {@code from} and {@code to}, converted to {@code target} (or left
     * at the native frequency they share when null).
     */
    Loaded load(FactorStore factors, Leg leg, LocalDate from, LocalDate to, Frequency target) {
        List<ReturnSeries> series = new ArrayList<>();
        Map<Frequency, List<String>> natives = new LinkedHashMap<>();
        for (FactorVersionRecord v : versions) {
            SeriesRequest.Resolved r = new SeriesRequest(v, leg, from, to, target).load(factors);
            natives.computeIfAbsent(r.frequency(), f -> new ArrayList<>()).add(v.name());
            series.add(r.series());
        }
        if (natives.size() > 1) {
            StringJoiner which = new StringJoiner("; ");
            natives.forEach((f, names) -> which.add(f.wireName() + ": " + String.join(", ", names)));
            throw ApiProblem.badRequest("The factors have different native frequencies (" + which + "); add frequency="
                    + coarsest(natives) + " (or another frequency no finer than every factor's) to convert them first.");
        }
        Frequency frequency = target != null ? target : natives.isEmpty() ? null : natives.keySet().iterator().next();
        return new Loaded(versions, series, frequency);
    }

    private static String coarsest(Map<Frequency, List<String>> natives) {
        return natives.keySet().stream().max(Enum::compareTo).orElseThrow().wireName();
    }
}
