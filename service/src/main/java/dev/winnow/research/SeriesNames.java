package dev.winnow.research;

import dev.winnow.stats.MonthlyBasis;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;

/**
 * The one place where a series name in a query parameter is resolved, for every endpoint that takes factor names
 * (correlations, model tests, and the risk-system endpoints): a factor's name gives its current version's spread.
 */
public final class SeriesNames {
    private final FactorStore factors;

    public SeriesNames(FactorStore factors) {
        this.factors = factors;
    }

    /** What a name resolved to: the factor version it reads, and the series. */
    public record Resolved(String name, FactorVersionRecord version, ReturnSeries series) {
    }

    /** The stored series a name denotes, at its native frequency. */
    public Resolved resolve(String name, String parameter) {
        FactorVersionRecord v = factors.current(name)
                .orElseThrow(() -> new InvalidRequestException("Unknown factor '" + name + "' in '" + parameter
                        + "'; GET /v1/factors lists them."));
        return new Resolved(name, v, factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD));
    }

    /** The series a name denotes on the monthly basis of the evidence table, restricted to months from..to. */
    public ReturnSeries monthly(String name, String parameter, java.time.LocalDate from, java.time.LocalDate to) {
        Resolved r = resolve(name, parameter);
        MonthlyBasis basis = MonthlyBasis.of(r.series());
        if (basis.excluded()) {
            throw new InvalidRequestException("'" + name + "' in '" + parameter + "' cannot be used: " + basis.excludedReason() + ".");
        }
        return basis.monthly().between(from, to);
    }
}
