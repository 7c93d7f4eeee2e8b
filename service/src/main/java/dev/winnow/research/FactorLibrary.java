package dev.winnow.research;

import dev.winnow.store.VersionStatus;
import dev.winnow.stats.FactorCovariance;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.SeriesAlignment;
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
 * The risk system's reads over several series at once: the library aligned on dates and the factor covariance.
 * Series are named as everywhere else ({@link SeriesNames}: a factor's spread, or {@code <factor>:<portfolio>} for
 * one of its stored portfolios). A request is served in two steps so that a cached answer costs no store query:
 * {@link #select} resolves the names from the in-memory catalog (the answer's data versions), and only a request
 * that is not cached reads and computes.
 */
public final class FactorLibrary {
    public static final int MAX_SERIES = 500;

    private final FactorStore factors;
    private final SeriesNames names;

    public FactorLibrary(FactorStore factors, SeriesNames names) {
        this.factors = factors;
        this.names = names;
    }

    /** The named series, each once, in the order given; every version's data version is in {@link #versions()}. */
    public record Selection(List<SeriesNames.Named> series) {
        public Selection {
            series = List.copyOf(series);
        }

        public List<String> names() {
            return series.stream().map(SeriesNames.Named::name).toList();
        }

        /** The factor version each series reads, in order (a portfolio reads its factor's version). */
        public List<FactorVersionRecord> versions() {
            return series.stream().map(SeriesNames.Named::version).toList();
        }
    }

    /** Each selected series with the range and frequency applied, and the frequency all of them now have. */
    public record Loaded(Selection selection, List<ReturnSeries> series, Frequency frequency) {
    }

    /** The aligned download: the series (range, frequency and form applied) on one date axis. */
    public record AlignedReturns(Loaded loaded, SeriesAlignment.Join join, SeriesAlignment.Aligned aligned) {
    }

    /**
     * The sample, the settings and the estimate of one covariance.
     *
     * @param first the sample's first date, @param last its last, @param observations its length
     */
    public record Covariance(List<String> names, Frequency frequency, LocalDate first, LocalDate last, int observations,
                             CovarianceSettings settings, boolean annualized, FactorCovariance.Estimate estimate) {
    }

    /**
     * The named series ({@code parameter} names the request field in problems). Null or empty names mean every live
     * factor that has been built (status ready), by name, when {@code defaultAll}; else a problem.
     */
    public Selection select(List<String> requested, String parameter, boolean defaultAll, int min) {
        if (requested == null || requested.isEmpty()) {
            if (!defaultAll) {
                throw new InvalidRequestException("'" + parameter + "' must list at least " + min + " factor name(s).");
            }
            List<SeriesNames.Named> live = new ArrayList<>();
            for (FactorVersionRecord v : factors.catalog().listCurrent(false)) {
                if (v.status() == VersionStatus.READY) {
                    live.add(new SeriesNames.Named(v.name(), v, null));
                }
            }
            return limited(live, parameter);
        }
        if (requested.size() < min) {
            throw new InvalidRequestException("'" + parameter + "' must list at least " + min + " factor names; got " + requested.size() + ".");
        }
        if (requested.stream().distinct().count() != requested.size()) {
            throw new InvalidRequestException("'" + parameter + "' names a series twice; list each once.");
        }
        if (requested.size() > MAX_SERIES) {
            throw tooMany(requested.size(), parameter);
        }
        List<SeriesNames.Named> named = new ArrayList<>();
        for (String name : requested) {
            named.add(names.name(name, parameter));
        }
        return new Selection(named);
    }

    /** Factor spreads by version (portfolio risk's factors come from the loadings regression, already resolved). */
    public Selection selectVersions(List<FactorVersionRecord> versions) {
        return new Selection(versions.stream().map(v -> new SeriesNames.Named(v.name(), v, null)).toList());
    }

    private static Selection limited(List<SeriesNames.Named> named, String parameter) {
        if (named.size() > MAX_SERIES) {
            throw tooMany(named.size(), parameter);
        }
        return new Selection(named);
    }

    private static InvalidRequestException tooMany(int count, String parameter) {
        return new InvalidRequestException("At most " + MAX_SERIES + " series per request; '" + parameter + "' gives " + count
                + ". Ask for them in several requests.");
    }

    /**
     * Every selected series ({@code leg} of a factor; a portfolio's own returns) between {@code from} and
     * {@code to}, converted to {@code target} by {@link FrequencyConversion#compound} (or left at the native
     * frequency they share when null: without a target, different native frequencies are a problem naming them).
     */
    public Loaded load(Selection selection, Leg leg, LocalDate from, LocalDate to, Frequency target) {
        List<ReturnSeries> series = new ArrayList<>();
        Map<Frequency, List<String>> natives = new LinkedHashMap<>();
        for (SeriesNames.Named named : selection.series()) {
            ReturnSeries stored = names.series(named, leg);
            Frequency nativeFrequency = Frequency.fromDates(List.of(stored.dates()));
            ReturnSeries ranged = stored.between(from, to);
            natives.computeIfAbsent(target == null ? nativeFrequency : target, f -> new ArrayList<>()).add(named.name());
            if (target == null || target == nativeFrequency) {
                series.add(ranged);
            } else if (target.compareTo(nativeFrequency) < 0) {
                throw new InvalidRequestException("'" + named.name() + "' is " + nativeFrequency.wireName()
                        + "; it cannot be converted to the finer frequency '" + target.wireName() + "'.");
            } else {
                series.add(FrequencyConversion.compound(ranged, target));
            }
        }
        if (natives.size() > 1) {
            StringJoiner which = new StringJoiner("; ");
            natives.forEach((f, n) -> which.add(f.wireName() + ": " + String.join(", ", n)));
            String coarsest = natives.keySet().stream().max(Enum::compareTo).orElseThrow().wireName();
            throw new InvalidRequestException("The series have different native frequencies (" + which + "); add frequency="
                    + coarsest + " (or another frequency no finer than every series') to convert them first.");
        }
        Frequency frequency = natives.isEmpty() ? target : natives.keySet().iterator().next();
        return new Loaded(selection, series, frequency);
    }

    /** The selected series converted and ranged as {@link #load}, in {@code cumulative} form if asked, aligned by {@code join}. */
    public AlignedReturns returns(Selection selection, Leg leg, LocalDate from, LocalDate to, Frequency target, boolean cumulative,
                                  SeriesAlignment.Join join) {
        Loaded loaded = load(selection, leg, from, to, target);
        List<ReturnSeries> series = cumulative ? loaded.series().stream().map(FrequencyConversion::cumulative).toList() : loaded.series();
        return new AlignedReturns(loaded, join, SeriesAlignment.align(series, join));
    }

    /**
     * The covariance of the selected series' spreads (portfolios' returns) at {@code target} (native when null),
     * over the last {@code settings.window()} dates up to {@code settings.to()} on which every series has a return,
     * estimated by {@link FactorCovariance#estimate} and annualised by the frequency's periods per year when asked.
     */
    public Covariance covariance(Selection selection, CovarianceSettings settings, Frequency target, boolean annualize) {
        Loaded loaded = load(selection, Leg.SPREAD, null, settings.to(), target);
        SeriesAlignment.Aligned common = SeriesAlignment.align(loaded.series(), SeriesAlignment.Join.INNER);
        int n = common.size();
        int start = settings.window() == null ? 0 : Math.max(0, n - settings.window());
        int count = n - start;
        if (count < 2) {
            throw new InvalidRequestException("The series share " + count + " date(s)" + (settings.to() != null ? " up to " + settings.to() : "")
                    + "; a covariance needs at least 2. Choose series that overlap or a later 'to'.");
        }
        if (settings.nwLags() >= count) {
            throw new InvalidRequestException("nw_lags " + settings.nwLags() + " must be smaller than the " + count
                    + " observations in the sample; choose fewer lags or a longer window.");
        }
        int k = loaded.series().size();
        double[][] x = new double[count][k];
        for (int t = 0; t < count; t++) {
            for (int i = 0; i < k; i++) {
                x[t][i] = common.values()[i][start + t];
            }
        }
        FactorCovariance.Estimate e = FactorCovariance.estimate(x, settings.halfLife(), settings.nwLags());
        if (annualize) {
            e = e.annualized(loaded.frequency().periodsPerYear());
        }
        return new Covariance(selection.names(), loaded.frequency(), common.dates()[start], common.dates()[n - 1], count, settings,
                annualize, e);
    }
}
