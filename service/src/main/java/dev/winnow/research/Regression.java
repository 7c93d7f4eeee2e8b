package dev.winnow.research;

import dev.winnow.construct.LoadingsSpec;
import dev.winnow.stats.Frequency;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsStore.LoadingsConfig;
import dev.winnow.store.PanelStore.PanelRecord;

import java.util.List;
import java.util.NoSuchElementException;
import java.util.Optional;

/** The factors and settings of one request, resolved to current factor versions. */
public record Regression(LoadingsSpec spec, List<FactorVersionRecord> versions) {

    public String fingerprint() {
        return LoadingsStore.fingerprint(spec, versions);
    }

    /**
     * Without factors, the panel's config supplies them (and its window and min_obs unless given); with factors,
     * window and min_obs default by the panel's frequency. Every failure is a problem naming what to send instead.
     */
    public static Regression resolve(PanelRecord panel, LoadingsSettings settings, LoadingsStore loadings, FactorStore factors) {
        Integer window = settings.window();
        Integer minObs = settings.minObs();
        Frequency frequency = Optional.ofNullable(Frequency.fromWireName(panel.frequency())).orElse(Frequency.DAILY);
        LoadingsSpec spec;
        try {
            if (settings.factors() == null) {
                LoadingsConfig config = loadings.config(panel.id()).orElseThrow(() -> new InvalidRequestException(
                        "Query parameter 'factors' is required: panel '" + panel.name() + "' has no loadings config to take them from."));
                LoadingsSpec configured = config.spec();
                int w = window != null ? window : configured.window();
                int m = minObs != null ? minObs
                        : window != null ? LoadingsSpec.defaultMinObs(w, configured.factorCount()) : configured.minObs();
                spec = new LoadingsSpec(configured.factors(), w, m);
            } else {
                spec = LoadingsSpec.withDefaults(settings.factors(), window, minObs, frequency);
            }
        } catch (IllegalArgumentException e) {
            throw new InvalidRequestException("Loadings settings: " + e.getMessage() + ".");
        }
        for (String name : spec.factors()) {
            if (name.indexOf(':') >= 0) {
                throw new InvalidRequestException("'" + name + "' names a portfolio; loadings, exposures and risk regress on factors"
                        + " (their spreads): name the factor, e.g. '" + name.substring(0, name.indexOf(':')) + "'. Portfolios can be"
                        + " read in /v1/returns, /v1/covariance, correlations and model tests.");
            }
        }
        if (spec.window() > panel.dateCount()) {
            throw new InvalidRequestException("Window " + spec.window() + (window == null ? " (the default for " + frequency.wireName()
                    + " panels)" : "") + " is larger than the " + panel.dateCount() + " dates of panel '" + panel.name()
                    + "'; pass window=" + panel.dateCount() + " or less.");
        }
        try {
            return new Regression(spec, LoadingsFactors.currentVersions(factors, spec.factors()));
        } catch (NoSuchElementException e) {
            // the factors are named in the query or body, not in the path: a bad request naming the factor
            throw new InvalidRequestException(e.getMessage(), NameKind.FACTOR);
        } catch (IllegalStateException e) {
            throw new InvalidRequestException(e.getMessage());
        }
    }
}
