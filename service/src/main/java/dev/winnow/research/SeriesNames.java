package dev.winnow.research;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorEngine;
import dev.winnow.stats.MonthlyBasis;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.time.LocalDate;
import java.util.List;

/**
 * The one place where a series name in a query parameter is resolved, for every endpoint that takes factor names
 * (correlations, model tests, and the risk-system endpoints):
 * <ul>
 *   <li>{@code <factor>}: the current version's spread;</li>
 *   <li>{@code <factor>:<portfolio>}: one of its stored portfolios, a bucket "1".."B" of a sort factor or one of
 *       the six of a size_sort factor ({@code small_low}, ..., {@code big_high}), for example {@code value:5} or
 *       {@code hml:small_high}.</li>
 * </ul>
 * Unknown factors, factors without portfolios and portfolios a factor does not have are
 * {@link InvalidRequestException}s that say what exists.
 */
public final class SeriesNames {
    private final FactorStore factors;

    public SeriesNames(FactorStore factors) {
        this.factors = factors;
    }

    /** What a name resolved to: the factor version it reads, the portfolio (null for the spread), and the series. */
    public record Resolved(String name, FactorVersionRecord version, String portfolio, ReturnSeries series) {
    }

    /**
     * A name resolved to what it reads, without reading it: the factor version (whose data version covers its
     * spread, legs and portfolios alike, since every build bumps it) and the portfolio (null for the spread).
     */
    public record Named(String name, FactorVersionRecord version, String portfolio) {
        public boolean isPortfolio() {
            return portfolio != null;
        }
    }

    /** The stored series a name denotes, at its native frequency. */
    public Resolved resolve(String name, String parameter) {
        Named named = name(name, parameter);
        return new Resolved(name, named.version(), named.portfolio(), series(named, FactorStore.Leg.SPREAD));
    }

    /**
     * What a name denotes, from the in-memory catalog and the version's definition (no store query), so that a
     * cached answer can be keyed and served before any series is read.
     */
    public Named name(String name, String parameter) {
        int colon = name.lastIndexOf(':');
        String factor = colon < 0 ? name : name.substring(0, colon);
        FactorVersionRecord v = factors.catalog().current(factor)
                .orElseThrow(() -> new InvalidRequestException("Unknown factor '" + factor + "' in '" + parameter + "'", NameKind.FACTOR));
        if (colon < 0) {
            return new Named(name, v, null);
        }
        String portfolio = name.substring(colon + 1);
        List<String> names = portfolioNames(v);
        if (names.isEmpty()) {
            throw new InvalidRequestException("'" + name + "' in '" + parameter + "': factor '" + factor + "' is a "
                    + DefinitionJson.wire(v.method()) + " factor and has no portfolios; sort and size_sort factors have them.");
        }
        if (!names.contains(portfolio)) {
            throw new InvalidRequestException("'" + name + "' in '" + parameter + "': factor '" + factor + "' has no portfolio '"
                    + portfolio + "'; its portfolios are " + String.join(", ", names) + ".");
        }
        return new Named(name, v, portfolio);
    }

    /**
     * The stored series of a resolved name: {@code leg} of the factor, or the portfolio's returns (a portfolio has
     * only its own returns: asking for another leg than the spread is a problem).
     */
    public ReturnSeries series(Named named, FactorStore.Leg leg) {
        if (!named.isPortfolio()) {
            return factors.series(named.version(), leg);
        }
        if (leg != FactorStore.Leg.SPREAD) {
            throw new InvalidRequestException("'" + named.name() + "' is a portfolio; it has no " + leg.name().toLowerCase(java.util.Locale.ROOT)
                    + " form (net and legs are a factor's). Drop the option or name the factor itself.");
        }
        return factors.portfolios(named.version()).getOrDefault(named.portfolio(), ReturnSeries.empty());
    }

    /** The series a name denotes on the monthly basis of the evidence table, restricted to months from..to. */
    public ReturnSeries monthly(String name, String parameter, LocalDate from, LocalDate to) {
        Resolved r = resolve(name, parameter);
        MonthlyBasis basis = MonthlyBasis.of(r.series());
        if (basis.excluded()) {
            throw new InvalidRequestException("'" + name + "' in '" + parameter + "' cannot be used: " + basis.excludedReason() + ".");
        }
        return basis.monthly().between(from, to);
    }

    /** The names of the portfolios a version stores, in the definition's order; empty for market and external. */
    public static List<String> portfolioNames(FactorVersionRecord v) {
        DefinitionJson.Parsed parsed = DefinitionJson.read(v.definitionJson());
        if (!parsed.ok()) {
            return List.of();
        }
        FactorDefinition def = parsed.definition();
        return FactorEngine.portfolioNames(def);
    }
}
