package dev.winnow.research;

import dev.winnow.construct.CharacteristicExposures;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.FactorGrid;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.PortfolioExposure;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.construct.SecurityLoadingsHistory;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
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
public final class LoadingsService {
    private final PanelStore panels;
    private final FactorStore factors;
    private final LoadingsStore loadings;
    private final WorkQueue queue;
    private final Map<Long, SecurityCodes> codeCache = new ConcurrentHashMap<>();

    public LoadingsService(PanelStore panels, FactorStore factors, LoadingsStore loadings, WorkQueue queue) {
        this.panels = panels;
        this.factors = factors;
        this.loadings = loadings;
        this.queue = queue;
    }

    /** Regression loadings at a date; {@code rows} orders the table's rows by security code. */
    public record Table(PanelRecord panel, LocalDate date, LoadingsSpec spec, LoadingsTable table, List<Integer> rows, Map<Integer, String> codes) {
    }

    /** Characteristic z-scores at a date, one array per column; {@code rows} orders the securities by code. */
    public record Characteristic(PanelRecord panel, LocalDate date, List<String> columns, int[] securityIds, double[][] scores,
                          List<Integer> rows, Map<Integer, String> codes) {
    }

    /** One security's loadings over a date range; {@code history} is null when the range holds no grid date. */
    public record History(PanelRecord panel, String security, LoadingsSpec spec, SecurityLoadingsHistory history) {
    }

    /** A portfolio's exposures; {@code securities} are the holdings' codes in request order. */
    public record Exposures(PanelRecord panel, LocalDate date, LoadingsSpec spec, PortfolioExposure exposure, List<String> securities) {
    }

    /**
     * {@code source} hears "stored" or "computed" before any computing, so that a problem found while computing
     * (a date off the grid) still carries it.
     */
    public Table table(PanelRecord panel, LocalDate date, LoadingsSettings settings, Consumer<String> source) {
        Regression regression = Regression.resolve(panel, settings, loadings, factors);
        LoadingsTable table = loadingsAt(panel, date, regression, source);
        SecurityCodes codes = codes(panel);
        return new Table(panel, date, regression.spec(), table, codes.rowsByCode(table.securityIds()), codes.byId());
    }

    public Characteristic characteristic(PanelRecord panel, LocalDate date, List<String> columns) {
        List<LocalDate> grid = panels.dates(panel.id());
        CrossSection cs = panels.slice(panel.id(), grid.get(PanelDates.index(grid, date, panel.name())));
        double[][] scores = CharacteristicExposures.zScores(cs, columns);
        SecurityCodes codes = codes(panel);
        return new Characteristic(panel, date, columns, cs.securityIds(), scores,
                codes.rowsByCode(cs.securityIds()), codes.byId());
    }

    /** {@code from} and {@code to} may be null (the panel's first and last date). */
    public History history(PanelRecord panel, String security, LocalDate from, LocalDate to, LoadingsSettings settings) {
        Regression regression = Regression.resolve(panel, settings, loadings, factors);
        int securityId = codes(panel).byCode().getOrDefault(security, -1);
        if (securityId < 0) {
            throw new UnknownNameException("Panel '" + panel.name() + "' has no security '" + security + "'.");
        }
        StorePanelSource source = panels.source(panel.id());
        List<LocalDate> grid = source.dates();
        int fromIndex = from == null ? 0 : PanelDates.insertionPoint(grid, from);
        int toIndex = to == null ? grid.size() - 1 : PanelDates.insertionPoint(grid, to.plusDays(1)) - 1;
        LoadingsSpec spec = regression.spec();
        SecurityLoadingsHistory history = fromIndex > toIndex ? null : SecurityLoadings.history(source,
                FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), grid), securityId,
                fromIndex, toIndex, spec.window(), spec.minObs());
        return new History(panel, security, spec, history);
    }

    /** Hears the source as {@link #table} does. */
    public Exposures exposures(PanelRecord panel, LocalDate date, List<String> securities, double[] weights, LoadingsSettings settings,
                               Consumer<String> source) {
        Map<String, Integer> ids = codes(panel).byCode();
        int[] securityIds = securities.stream().mapToInt(code -> ids.getOrDefault(code, -1)).toArray();
        Regression regression = Regression.resolve(panel, settings, loadings, factors);
        LoadingsTable table = loadingsAt(panel, date, regression, source);
        return new Exposures(panel, date, regression.spec(),
                PortfolioExposure.of(table, securityIds, weights), securities);
    }

    /**
     * What a portfolio's risk needs from the loadings: the exposures of {@code weights} (as {@link #exposures}), the
     * weights and residual volatilities of the holdings that have loadings, in holding order, and the factor
     * versions the loadings regress on. No holding with loadings is an {@link InvalidRequestException}.
     */
    public record RiskInputs(Exposures exposures, double[] coveredWeights, double[] residualVols, List<FactorVersionRecord> versions) {
    }

    /** Hears the source as {@link #table} does. */
    public RiskInputs riskInputs(PanelRecord panel, LocalDate date, List<String> securities, double[] weights, LoadingsSettings settings,
                                 Consumer<String> source) {
        Map<String, Integer> ids = codes(panel).byCode();
        int[] securityIds = securities.stream().mapToInt(code -> ids.getOrDefault(code, -1)).toArray();
        Regression regression = Regression.resolve(panel, settings, loadings, factors);
        LoadingsTable table = loadingsAt(panel, date, regression, source);
        PortfolioExposure exposure = PortfolioExposure.of(table, securityIds, weights);
        if (exposure.missingHoldings().size() == securityIds.length) {
            throw new InvalidRequestException("None of the " + securityIds.length + " securities has loadings at " + date
                    + " (not in panel '" + panel.name() + "' then, or too few observations); nothing to measure.");
        }
        int covered = securityIds.length - exposure.missingHoldings().size();
        double[] coveredWeights = new double[covered];
        double[] residualVols = new double[covered];
        int c = 0;
        for (int h = 0; h < securityIds.length; h++) {
            if (!exposure.missingHoldings().contains(h)) {
                coveredWeights[c] = weights[h];
                residualVols[c++] = table.residualVol()[table.rowOf(securityIds[h])];
            }
        }
        return new RiskInputs(new Exposures(panel, date, regression.spec(), exposure, securities), coveredWeights, residualVols,
                regression.versions());
    }

    public LoadingsConfig saveConfig(PanelRecord panel, LoadingsSettings settings) {
        return loadings.saveConfig(panel.id(), Regression.resolve(panel, settings, loadings, factors).spec());
    }

    public LoadingsConfig config(PanelRecord panel) {
        return loadings.config(panel.id()).orElseThrow(() -> new UnknownNameException("Panel '" + panel.name()
                + "' has no loadings config; PUT /v1/panels/" + panel.name() + "/loadings-config with {\"factors\": [...]} first."));
    }

    /** Queues the job that stores the loadings of every date under the panel's config; returns the job id. */
    public long startHistory(PanelRecord panel) {
        config(panel);
        return queue.queueLoadingsHistory(panel.name(), panel.id());
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
        StorePanelSource source = panels.source(panel.id());
        int index = PanelDates.index(source.dates(), date, panel.name());
        FactorGrid grid = FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), source.dates());
        return SecurityLoadings.at(source, grid, index, regression.spec().window(), regression.spec().minObs());
    }
}
