package dev.winnow.api;

import dev.winnow.construct.CharacteristicExposures;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.FactorGrid;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.PortfolioExposure;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.construct.SecurityLoadingsHistory;
import dev.winnow.ingest.JobQueue;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.PortfolioRisk;
import dev.winnow.ingest.LoadingsJobs;
import dev.winnow.store.FactorStore;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsStore.LoadingsConfig;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import dev.winnow.store.StorePanelSource;

import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;
import java.util.function.Consumer;

/**
 * The answers of the loadings endpoints: regression loadings (from the store when it holds them for the same inputs,
 * else computed now), characteristic exposures, one security's history, portfolio exposures, and the panel's
 * loadings config with its history job.
 */
final class LoadingsService {
    private final PanelStore panels;
    private final FactorStore factors;
    private final LoadingsStore loadings;
    private final JobQueue queue;
    private final Map<Long, SecurityCodes> codeCache = new ConcurrentHashMap<>();

    LoadingsService(PanelStore panels, FactorStore factors, LoadingsStore loadings, JobQueue queue) {
        this.panels = panels;
        this.factors = factors;
        this.loadings = loadings;
        this.queue = queue;
    }

    /** Regression loadings at a date; {@code rows} orders the table's rows by security code. */
    record Table(PanelRecord panel, LocalDate date, LoadingsSpec spec, LoadingsTable table, List<Integer> rows, Map<Integer, String> codes) {
    }

    /** Characteristic z-scores at a date, one array per column; {@code rows} orders the securities by code. */
    record Characteristic(PanelRecord panel, LocalDate date, List<String> columns, int[] securityIds, double[][] scores,
                          List<Integer> rows, Map<Integer, String> codes) {
    }

    /** One security's loadings over a date range; {@code history} is null when the range holds no grid date. */
    record History(PanelRecord panel, String security, LoadingsSpec spec, SecurityLoadingsHistory history) {
    }

    /** A portfolio's exposures; {@code securities} are the holdings' codes in request order. */
    record Exposures(PanelRecord panel, LocalDate date, LoadingsSpec spec, PortfolioExposure exposure, List<String> securities) {
    }

    /**
     * {@code source} hears "stored" or "computed" before any computing, so that a problem found while computing
     * (a date off the grid) still carries it.
     */
    Table table(LoadingsRequest request, Consumer<String> source) {
        PanelRecord panel = request.panel();
        Regression regression = Regression.resolve(panel, request.regression(), loadings, factors);
        LoadingsTable table = loadingsAt(panel, request.date(), regression, source);
        SecurityCodes codes = codes(panel);
        return new Table(panel, request.date(), regression.spec(), table, codes.rowsByCode(table.securityIds()), codes.byId());
    }

    Characteristic characteristic(LoadingsRequest request) {
        PanelRecord panel = request.panel();
        List<LocalDate> grid = panels.dates(panel.id());
        CrossSection cs = panels.slice(panel.id(), grid.get(PanelDates.index(grid, request.date(), panel.name())));
        double[][] scores = CharacteristicExposures.zScores(cs, request.columns());
        SecurityCodes codes = codes(panel);
        return new Characteristic(panel, request.date(), request.columns(), cs.securityIds(), scores,
                codes.rowsByCode(cs.securityIds()), codes.byId());
    }

    History history(SecurityHistoryRequest request) {
        PanelRecord panel = request.panel();
        Regression regression = Regression.resolve(panel, request.regression(), loadings, factors);
        int securityId = codes(panel).byCode().getOrDefault(request.security(), -1);
        if (securityId < 0) {
            throw ApiProblem.notFound("Panel '" + panel.name() + "' has no security '" + request.security() + "'.");
        }
        StorePanelSource source = new StorePanelSource(panels, panel.id());
        List<LocalDate> grid = source.dates();
        int fromIndex = request.from() == null ? 0 : PanelDates.insertionPoint(grid, request.from());
        int toIndex = request.to() == null ? grid.size() - 1 : PanelDates.insertionPoint(grid, request.to().plusDays(1)) - 1;
        LoadingsSpec spec = regression.spec();
        SecurityLoadingsHistory history = fromIndex > toIndex ? null : SecurityLoadings.history(source,
                FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), grid), securityId,
                fromIndex, toIndex, spec.window(), spec.minObs());
        return new History(panel, request.security(), spec, history);
    }

    /** Hears the source as {@link #table} does. */
    Exposures exposures(ExposuresRequest request, Consumer<String> source) {
        PanelRecord panel = request.panel();
        Map<String, Integer> ids = codes(panel).byCode();
        int[] securityIds = request.securities().stream().mapToInt(code -> ids.getOrDefault(code, -1)).toArray();
        Regression regression = Regression.resolve(panel, request.regression(), loadings, factors);
        LoadingsTable table = loadingsAt(panel, request.date(), regression, source);
        return new Exposures(panel, request.date(), regression.spec(),
                PortfolioExposure.of(table, securityIds, request.weights()), request.securities());
    }

    /** A portfolio's risk: its active exposures, the factor covariance at its date, and the decomposition. */
    record Risk(PanelRecord panel, LocalDate date, List<String> factors, PortfolioExposure exposure, List<String> securities,
                LibraryRoutes.Covariance covariance, PortfolioRisk risk) {
    }

    /**
     * Exposures x of the active weights from the securities' loadings at the date (as {@link #exposures}), the
     * factor covariance F at the panel's frequency over the last common date at or before it (annualised), and the
     * specific variance periods-per-year x sum_i w_i^2 s_i^2 over the securities with loadings; hears the loadings
     * source as {@link #table} does.
     */
    Risk risk(RiskRequest request, Consumer<String> source) {
        PanelRecord panel = request.panel();
        Map<String, Integer> ids = codes(panel).byCode();
        int[] securityIds = request.securities().stream().mapToInt(code -> ids.getOrDefault(code, -1)).toArray();
        Regression regression = Regression.resolve(panel, request.regression(), loadings, factors);
        LoadingsTable table = loadingsAt(panel, request.date(), regression, source);
        PortfolioExposure exposure = PortfolioExposure.of(table, securityIds, request.activeWeights());
        if (exposure.missingHoldings().size() == securityIds.length) {
            throw ApiProblem.badRequest("None of the " + securityIds.length + " securities has loadings at " + request.date()
                    + " (not in panel '" + panel.name() + "' then, or too few observations); nothing to measure.");
        }
        Frequency frequency = Optional.ofNullable(Frequency.fromWireName(panel.frequency())).orElse(Frequency.DAILY);
        LibraryRoutes.Covariance covariance = LibraryRoutes.Covariance.of(new FactorSet(regression.versions())
                .load(factors, FactorStore.Leg.SPREAD, null, request.date(), frequency), request.covariance(), true);
        List<Double> coveredWeights = new java.util.ArrayList<>();
        List<Double> residualVols = new java.util.ArrayList<>();
        for (int h = 0; h < securityIds.length; h++) {
            if (!exposure.missingHoldings().contains(h)) {
                coveredWeights.add(request.activeWeights()[h]);
                residualVols.add(table.residualVol()[table.rowOf(securityIds[h])]);
            }
        }
        double specific = PortfolioRisk.specificVariance(coveredWeights.stream().mapToDouble(Double::doubleValue).toArray(),
                residualVols.stream().mapToDouble(Double::doubleValue).toArray(), frequency.periodsPerYear());
        PortfolioRisk risk;
        try {
            risk = PortfolioRisk.of(exposure.exposures(), covariance.estimate().covariance(), specific);
        } catch (IllegalArgumentException e) {
            throw ApiProblem.badRequest("The portfolio's risk cannot be decomposed: " + e.getMessage()
                    + " (active weights all zero, or a covariance that is not positive for these exposures).");
        }
        return new Risk(panel, request.date(), regression.spec().factors(), exposure, request.securities(), covariance, risk);
    }

    LoadingsConfig saveConfig(PanelRecord panel, LoadingsSettings settings) {
        return loadings.saveConfig(panel.id(), Regression.resolve(panel, settings, loadings, factors).spec());
    }

    LoadingsConfig config(PanelRecord panel) {
        return loadings.config(panel.id()).orElseThrow(() -> ApiProblem.notFound("Panel '" + panel.name()
                + "' has no loadings config; PUT /v1/panels/" + panel.name() + "/loadings-config with {\"factors\": [...]} first."));
    }

    /** Queues the job that stores the loadings of every date under the panel's config; returns the job id. */
    long startHistory(PanelRecord panel) {
        config(panel);
        return queue.enqueue(LoadingsJobs.KIND, LoadingsJobs.params(panel.name(), panel.id()));
    }

    private SecurityCodes codes(PanelRecord panel) {
        SecurityCodes cached = codeCache.get(panel.id());
        if (cached != null && cached.dataVersion() == panel.dataVersion()) {
            return cached;
        }
        SecurityCodes fresh = SecurityCodes.of(panel.dataVersion(), panels.securityCodes(panel.id()));
        codeCache.put(panel.id(), fresh);
        return fresh;
    }

    private LoadingsTable loadingsAt(PanelRecord panel, LocalDate date, Regression regression, Consumer<String> source) {
        Optional<LoadingsTable> stored = loadings.read(panel.id(), date, regression.fingerprint());
        source.accept(stored.isPresent() ? "stored" : "computed");
        return stored.orElseGet(() -> compute(panel, date, regression));
    }

    /** Loadings computed now from the panel's slices and the factors' current series. */
    private LoadingsTable compute(PanelRecord panel, LocalDate date, Regression regression) {
        StorePanelSource source = new StorePanelSource(panels, panel.id());
        int index = PanelDates.index(source.dates(), date, panel.name());
        FactorGrid grid = FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), source.dates());
        return SecurityLoadings.at(source, grid, index, regression.spec().window(), regression.spec().minObs());
    }
}
