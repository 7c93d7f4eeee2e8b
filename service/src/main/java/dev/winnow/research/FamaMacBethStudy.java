package dev.winnow.research;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSchema;
import dev.winnow.construct.PanelSource;
import dev.winnow.construct.Recipe;
import dev.winnow.construct.RecipeJson;
import dev.winnow.construct.SampleRows;
import dev.winnow.construct.Universe;
import dev.winnow.stats.CrossSectionRegression;
import dev.winnow.stats.EstimateSeries;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import dev.winnow.store.StorePanelSource;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Fama and MacBeth (1973, "Risk, Return, and Equilibrium: Empirical Tests", Journal of Political Economy 81(3),
 * 607-636) regressions on a panel: for every grid index R whose next grid date R+1 is within from..to, the
 * cross-sectional regression with intercept of each security's return at R+1 on its signals at R-(lag-1)
 * ({@link CrossSectionRegression}), over the securities that pass the universe, have every signal finite and a finite
 * return at R+1 (and a positive market_cap at R-(lag-1) for cap weighting, which is weighted least squares with those
 * caps as weights). With {@code standardize} each signal is z-scored over the period's sample first. A period with
 * n &lt;= k + 1 securities or a rank-deficient design is skipped and counted. The slopes' time series is summarised
 * by {@link EstimateSeries}. The panel is read in grid order on the request's thread while the periods' fits run on
 * the {@link StudyThreads}.
 */
public final class FamaMacBethStudy {
    private final PanelStore panels;
    private final FactorStore factors;
    private final StudyThreads threads;

    public FamaMacBethStudy(PanelStore panels, FactorStore factors, StudyThreads threads) {
        this.panels = panels;
        this.factors = factors;
        this.threads = threads;
    }

    public enum Weighting { EQUAL, CAP }

    /** A study as asked: signal names in the order given, each a column or a recipe. */
    public record Request(String panel, Map<String, Recipe> signals, int lag, boolean standardize, Weighting weighting,
                          Universe universe, LocalDate from, LocalDate to) {
        public Request {
            signals = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(signals));
        }
    }

    public record Coefficient(String name, EstimateSeries summary) {
    }

    /**
     * @param periods        regressions run
     * @param skipped        periods in range skipped (too few securities, rank deficient)
     * @param first          return date of the first regression run, null when none
     * @param last           return date of the last, null when none
     * @param meanRSquared   mean of the per-period r_squared
     * @param meanSecurities mean number of securities per regression
     * @param dates          return dates R+1 of the regressions run
     * @param slopes         per coefficient (intercept first), the slope of each regression run
     */
    public record Result(String panel, int periods, int skipped, LocalDate first, LocalDate last,
                         List<Coefficient> coefficients, double meanRSquared, double meanSecurities,
                         List<LocalDate> dates, Map<String, double[]> slopes) {
    }

    public Result run(Request request) {
        PanelRecord panel = panels.find(request.panel()).filter(PanelRecord::visible)
                .orElseThrow(() -> new InvalidRequestException("No panel '" + request.panel() + "'", NameKind.PANEL));
        PanelSchema schema = FactorDefinitions.schemaOf(panels.columns(panel.id()));
        List<String> names = new ArrayList<>(request.signals().keySet());
        List<String> problems = new ArrayList<>();
        for (Map.Entry<String, Recipe> e : request.signals().entrySet()) {
            if (e.getKey().equals("intercept")) {
                throw new InvalidRequestException("A signal may not be named 'intercept'; that name is the regression's constant.");
            }
            RecipeJson.check(e.getValue(), schema, panel.name(), "signals." + e.getKey(), problems);
        }
        if (!problems.isEmpty()) {
            throw new InvalidRequestException(String.join("; ", problems) + ".");
        }
        Universe universe = request.universe() == null ? Universe.ALL : request.universe();
        // only the columns the signals and the universe read are decoded
        java.util.Set<String> columns = new java.util.TreeSet<>(universe.labelColumns());
        for (Recipe recipe : request.signals().values()) {
            columns.addAll(recipe.numberColumns());
            columns.addAll(recipe.labelColumns());
        }
        StorePanelSource source = panels.source(panel.id(), columns::contains);
        List<CrossSectionSignal> signals = new ArrayList<>();
        for (Recipe recipe : request.signals().values()) {
            signals.add(CrossSectionSignal.of(recipe, source, signalFactors(recipe)));
        }
        for (String column : universe.labelFilters().keySet()) {
            if (!schema.isLabel(column)) {
                throw new InvalidRequestException("universe.labels names '" + column + "', which is not a label column of panel '"
                        + panel.name() + "'; label columns are: " + String.join(", ", schema.labelColumns()) + ".");
            }
        }
        if (request.weighting() == Weighting.CAP && !schema.hasMarketCap()) {
            throw new InvalidRequestException("weighting cap needs market_cap, and panel '" + panel.name() + "' has none; use equal.");
        }
        return regress(source, panel.name(), names, signals, request, universe, threads);
    }

    /** The spread series of every factor a recipe reads (trailing_beta's {@code against}). */
    private Map<String, ReturnSeries> signalFactors(Recipe recipe) {
        Map<String, ReturnSeries> out = new LinkedHashMap<>();
        for (String name : recipe.factors()) {
            FactorVersionRecord f = factors.current(name).orElseThrow(() -> new InvalidRequestException(
                    "A signal reads factor '" + name + "', which does not exist", NameKind.FACTOR));
            out.put(name, factors.series(f.factorId(), f.version(), FactorStore.Leg.SPREAD));
        }
        return out;
    }

    /** One period's regression as run on a study thread: its fit, or null when it was skipped. */
    private record Period(LocalDate returnDate, CrossSectionRegression fit, int securities) {
    }

    /** Sums over the periods run, in grid order. */
    private static final class Tally {
        final List<LocalDate> dates = new ArrayList<>();
        final List<double[]> coefficients = new ArrayList<>();
        double sumR2 = 0.0;
        int r2Count = 0;
        long securities = 0;
        int skipped = 0;

        void add(Period p) {
            if (p.fit() == null) {
                skipped++;
                return;
            }
            dates.add(p.returnDate());
            coefficients.add(p.fit().coefficients());
            securities += p.securities();
            if (!Double.isNaN(p.fit().rSquared())) {
                sumR2 += p.fit().rSquared();
                r2Count++;
            }
        }
    }

    /**
     * The regressions of every period in grid order. This thread reads the cross-sections and evaluates the signals
     * in order; each period's sample, standardisation and fit run on the study threads, and their results are tallied in
     * grid order, so every sum is taken in the same order as a sequential loop's.
     */
    static Result regress(PanelSource panel, String panelName, List<String> names, List<CrossSectionSignal> signals,
                          Request request, Universe universe, StudyThreads threads) {
        List<LocalDate> grid = panel.dates();
        int k = signals.size();
        int lag = request.lag();
        boolean cap = request.weighting() == Weighting.CAP;
        Tally tally = new Tally();
        StudyThreads.Pipeline<Period> fits = threads.pipeline(tally::add);
        for (int r = 0; r + 1 < grid.size(); r++) {
            LocalDate returnDate = grid.get(r + 1);
            if ((request.from() != null && returnDate.isBefore(request.from())) || (request.to() != null && returnDate.isAfter(request.to()))) {
                continue;
            }
            int signalIndex = r - (lag - 1);
            if (signalIndex < 0) {
                fits.submit(() -> new Period(returnDate, null, 0));
                continue;
            }
            CrossSection at = panel.crossSection(signalIndex);
            CrossSection next = panel.crossSection(r + 1);
            // the signals are evaluated here, in grid order; the sample is gathered and fitted on a study thread
            double[][] columns = new double[signals.size()][];
            for (int j = 0; j < columns.length; j++) {
                columns[j] = signals.get(j).values(signalIndex, at);
            }
            fits.submit(() -> {
                Sample sample = sample(at, next, columns, universe, cap);
                double[][] x = sample.x();
                if (request.standardize()) {
                    for (int j = 0; j < k && x != null; j++) {
                        x[j] = CrossSectionRegression.standardize(x[j]);
                        if (x[j] == null) {
                            x = null;
                        }
                    }
                }
                CrossSectionRegression fit = x == null ? null : CrossSectionRegression.fit(sample.y(), x, sample.weights());
                return new Period(returnDate, fit, sample.y().length);
            });
        }
        fits.finish();
        List<LocalDate> dates = tally.dates;
        List<double[]> coefficients = tally.coefficients;
        double sumR2 = tally.sumR2;
        int r2Count = tally.r2Count;
        long securities = tally.securities;
        int skipped = tally.skipped;
        int periods = dates.size();
        List<String> all = new ArrayList<>();
        all.add("intercept");
        all.addAll(names);
        List<Coefficient> summaries = new ArrayList<>();
        Map<String, double[]> slopes = new LinkedHashMap<>();
        for (int j = 0; j <= k; j++) {
            double[] series = new double[periods];
            for (int t = 0; t < periods; t++) {
                series[t] = coefficients.get(t)[j];
            }
            slopes.put(all.get(j), series);
            summaries.add(new Coefficient(all.get(j), EstimateSeries.of(series)));
        }
        return new Result(panelName, periods, skipped, periods == 0 ? null : dates.get(0),
                periods == 0 ? null : dates.get(periods - 1), summaries, r2Count == 0 ? Double.NaN : sumR2 / r2Count,
                periods == 0 ? Double.NaN : securities / (double) periods, dates, slopes);
    }

    private record Sample(double[] y, double[][] x, double[] weights) {
    }

    /** The period's regression sample: rows of {@code at} in the universe with every signal finite and a return in {@code next}. */
    private static Sample sample(CrossSection at, CrossSection next, double[][] columns, Universe universe, boolean cap) {
        int[] rows = SampleRows.inUniverse(universe, at);
        double[] caps = at.marketCaps();
        int[] ids = at.securityIds();
        int[] nextIds = next.securityIds();
        double[] nextReturns = next.returns();
        double[] y = new double[rows.length];
        double[][] x = new double[columns.length][rows.length];
        double[] w = cap ? new double[rows.length] : null;
        int n = 0;
        int cursor = 0;
        rows:
        for (int i : rows) {
            for (double[] column : columns) {
                if (!Double.isFinite(column[i])) {
                    continue rows;
                }
            }
            if (cap && !(Double.isFinite(caps[i]) && caps[i] > 0)) {
                continue;
            }
            while (cursor < nextIds.length && nextIds[cursor] < ids[i]) {
                cursor++;
            }
            if (cursor >= nextIds.length || nextIds[cursor] != ids[i] || !Double.isFinite(nextReturns[cursor])) {
                continue;
            }
            y[n] = nextReturns[cursor];
            for (int j = 0; j < columns.length; j++) {
                x[j][n] = columns[j][i];
            }
            if (cap) {
                w[n] = caps[i];
            }
            n++;
        }
        double[][] xs = new double[columns.length][];
        for (int j = 0; j < columns.length; j++) {
            xs[j] = java.util.Arrays.copyOf(x[j], n);
        }
        return new Sample(java.util.Arrays.copyOf(y, n), xs, cap ? java.util.Arrays.copyOf(w, n) : null);
    }
}
