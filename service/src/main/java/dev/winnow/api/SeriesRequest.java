package dev.winnow.api;

import dev.winnow.stats.Frequency;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Leg;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.List;

/**
 * The series a request names: factor, {@code version}, {@code leg} or {@code net=true}, {@code from}/{@code to} and
 * {@code frequency}. Every analytics endpoint reads its input through here, so they all agree on what a series is.
 */
record SeriesRequest(FactorVersionRecord version, Leg leg, LocalDate from, LocalDate to, Frequency targetFrequency) {

    static final List<String> FREQUENCIES = List.of("native", "daily", "weekly", "monthly", "quarterly", "annual");

    /** Reads the factor named in the path and the series parameters of the query. */
    static SeriesRequest of(Context ctx, FactorStore factors, String factorName) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, factorName);
        String legText = Requests.choiceParam(ctx, "leg", List.of("spread", "long", "short"), "spread");
        boolean net = Requests.booleanParam(ctx, "net");
        if (net && !legText.equals("spread")) {
            throw ApiProblem.badRequest("net=true applies to the spread only; drop 'leg' or 'net'.");
        }
        Leg leg = net ? Leg.NET : switch (legText) {
            case "long" -> Leg.LONG;
            case "short" -> Leg.SHORT;
            default -> Leg.SPREAD;
        };
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        return new SeriesRequest(v, leg, from, to, frequencyParam(ctx));
    }

    /** {@code from}/{@code to}, {@code frequency} and {@code form} of a series endpoint that is not one factor's spread. */
    record Window(LocalDate from, LocalDate to, Frequency target, String form) {
        static Window of(Context ctx) {
            LocalDate from = Requests.dateParam(ctx, "from");
            LocalDate to = Requests.dateParam(ctx, "to");
            Requests.checkRange(from, to);
            return new Window(from, to, frequencyParam(ctx), Requests.choiceParam(ctx, "form", List.of("period", "cumulative"), "period"));
        }

        boolean cumulative() {
            return form.equals("cumulative");
        }
    }

    static Frequency frequencyParam(Context ctx) {
        String f = Requests.choiceParam(ctx, "frequency", FREQUENCIES, "native");
        return f.equals("native") ? null : Frequency.fromWireName(f);
    }

    /** The stored series with the date range and frequency of the request applied. */
    Resolved load(FactorStore factors) {
        return convert(version.name(), factors.series(version, leg), from, to, targetFrequency);
    }

    /** A stored series (named {@code name} in problems) with a date range and a target frequency (null: native) applied. */
    static Resolved convert(String name, ReturnSeries stored, LocalDate from, LocalDate to, Frequency targetFrequency) {
        Frequency nativeFrequency = Frequency.fromDates(List.of(stored.dates()));
        ReturnSeries ranged = stored.between(from, to);
        if (targetFrequency == null || targetFrequency == nativeFrequency) {
            return new Resolved(ranged, nativeFrequency);
        }
        if (targetFrequency.compareTo(nativeFrequency) < 0) {
            throw ApiProblem.badRequest("'" + name + "' is " + nativeFrequency.wireName()
                    + "; it cannot be converted to the finer frequency '" + targetFrequency.wireName() + "'.");
        }
        return new Resolved(FrequencyConversion.compound(ranged, targetFrequency), targetFrequency);
    }

    /** As {@link #load}, answering 400 when nothing is left to compute on. */
    Resolved loadNonEmpty(FactorStore factors) {
        Resolved resolved = load(factors);
        if (resolved.series().size() == 0) {
            throw ApiProblem.badRequest("Factor '" + version.name() + "' has no observations"
                    + (from != null || to != null ? " between the requested dates" : " yet (status " + version.status().wireName() + ")")
                    + "; widen 'from'/'to' or wait for its build.");
        }
        return resolved;
    }

    record Resolved(ReturnSeries series, Frequency frequency) {
    }
}
