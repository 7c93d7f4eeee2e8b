package dev.winnow.store;

import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.NoSuchElementException;

/** The factor series a loadings regression reads: each factor's current version and its spread returns. */
public final class LoadingsFactors {
    private LoadingsFactors() {
    }

    /**
     * The current version of each named factor, in the given order (one query for all current versions, which is
     * cheaper than one query per factor for the factor sets of a risk model).
     *
     * @throws NoSuchElementException when a name is not a factor
     * @throws IllegalStateException  when a factor's current version has no finished series (building or failed)
     */
    public static List<FactorVersionRecord> currentVersions(FactorStore factors, List<String> names) {
        Map<String, FactorVersionRecord> current = new HashMap<>();
        for (FactorVersionRecord v : factors.listCurrent(true)) {
            current.put(v.name(), v);
        }
        List<FactorVersionRecord> versions = new ArrayList<>(names.size());
        for (String name : names) {
            FactorVersionRecord v = current.get(name);
            if (v == null) {
                throw new NoSuchElementException("No factor '" + name + "'");
            }
            if (v.status() != VersionStatus.READY) {
                throw new IllegalStateException("Factor '" + name + "' version " + v.version() + " is " + v.status().wireName()
                        + ", so it has no series to regress on yet; wait for its build job or fix its definition.");
            }
            versions.add(v);
        }
        return versions;
    }

    /** Each version's spread return series, in order. */
    public static List<ReturnSeries> series(FactorStore factors, List<FactorVersionRecord> versions) {
        List<ReturnSeries> series = new ArrayList<>(versions.size());
        for (FactorVersionRecord v : versions) {
            series.add(factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD));
        }
        return series;
    }
}
