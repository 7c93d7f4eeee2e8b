package dev.winnow.research;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.SampleRows;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.EstimateSeries;
import dev.winnow.stats.KeyedValues;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorePanelSource;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;

/**
 * Information coefficients of a factor's signal: for every grid index R (whatever the rebalancing calendar) and
 * horizon h, the cross-sectional correlation (Pearson 1896, or Spearman 1904 = Pearson on average ranks) between the
 * signal as a formation at R would use it (the values at R-(lag-1) of the securities with a finite signal that pass
 * the universe; the market-cap requirement of cap weighting does not apply) and each security's one-period return at
 * grid index R+h, over the securities that have both. No value when fewer than {@code minSecurities} have both or
 * R+h is past the last date. The raw signal is used, so a low_minus_high factor that works has a negative IC. Each
 * horizon's series is summarised by {@link EstimateSeries} (ic_ir = mean / stdev). The panel is read once, in grid
 * order, keeping the signal samples of the last max(h) grid dates; each date's signal sample and return sample are
 * sorted once ({@link KeyedValues}) and every horizon's Spearman ranks are read off those orders. The request's
 * thread only reads the panel and evaluates the signal in grid order; each date's samples, their sorts and its
 * correlations run on the {@link StudyThreads}, each task writing only its own cells, so the answer does not depend
 * on the threads.
 */
public final class InformationCoefficients {
    public static final int MAX_HORIZONS = 24;
    public static final int MAX_HORIZON = 60;

    private final PanelStore panels;
    private final FactorStore factors;
    private final StudyThreads threads;

    public InformationCoefficients(PanelStore panels, FactorStore factors, StudyThreads threads) {
        this.panels = panels;
        this.factors = factors;
        this.threads = threads;
    }

    public record Request(FactorVersionRecord version, List<Integer> horizons, Correlations.Method method, int minSecurities,
                          LocalDate from, LocalDate to) {
        public Request {
            horizons = List.copyOf(horizons);
        }
    }

    /** @param ic per horizon (in request order), one value per date, NaN where there is none */
    public record Result(FactorVersionRecord version, Correlations.Method method, List<Integer> horizons, List<LocalDate> dates,
                         List<double[]> ic, List<EstimateSeries> summary) {
    }

    public Result run(Request request) {
        FactorVersionRecord v = request.version();
        FactorDefinition def = FactorBuilds.definition(v);
        if (def.method() != Method.SORT && def.method() != Method.SIZE_SORT && def.method() != Method.RANK_WEIGHTED) {
            throw new ConflictException("Factor '" + v.name() + "' is a " + DefinitionJson.wire(v.method()) + " factor and has no signal;"
                    + " information coefficients exist for sort, size_sort and rank_weighted factors.");
        }
        if (v.panelId() == null) {
            throw new InvalidRequestException("Factor '" + v.name() + "' has no panel.");
        }
        // only the columns the definition reads are decoded
        StorePanelSource panel = panels.source(v.panelId(), def.columnsRead()::contains);
        Map<String, ReturnSeries> signalFactors = new LinkedHashMap<>();
        for (String name : def.signal().factors()) {
            FactorVersionRecord f = factors.catalog().current(name).orElseThrow(() -> new InvalidRequestException(
                    "The signal reads factor '" + name + "', which does not exist any more."));
            signalFactors.put(name, factors.series(f, FactorStore.Leg.SPREAD));
        }
        CrossSectionSignal signal = CrossSectionSignal.of(def.signal(), panel, signalFactors);
        List<LocalDate> grid = panel.dates();
        int lag = def.effectiveLag();
        List<Integer> horizons = request.horizons();
        int maxH = horizons.stream().mapToInt(Integer::intValue).max().orElse(1);
        List<LocalDate> dates = new ArrayList<>();
        int first = -1;
        for (int r = 0; r < grid.size(); r++) {
            if (inRange(grid.get(r), request.from(), request.to())) {
                first = first < 0 ? r : first;
                dates.add(grid.get(r));
            }
        }
        List<double[]> ic = new ArrayList<>();
        for (int k = 0; k < horizons.size(); k++) {
            double[] row = new double[dates.size()];
            Arrays.fill(row, Double.NaN);
            ic.add(row);
        }
        if (!dates.isEmpty()) {
            int last = first + dates.size() - 1;
            Correlations.Method method = request.method();
            // each formation's signal sample, sorted on a study thread; later dates' correlations wait for it there
            Map<Integer, CompletableFuture<KeyedValues>> samples = new HashMap<>();
            StudyThreads.Pipeline<Void> pairs = threads.pipeline(done -> { });
            int start = Math.max(0, first - (lag - 1));
            int end = Math.min(grid.size() - 1, last + maxH);
            for (int t = start; t <= end; t++) {
                CrossSection rows = panel.crossSection(t);
                int r = t + lag - 1; // the formation date whose signal these rows hold
                double[] signalValues = r >= first && r <= last ? signal.values(t, rows) : null; // in grid order, here
                CompletableFuture<KeyedValues> own = signalValues == null ? null : new CompletableFuture<>();
                if (own != null) {
                    samples.put(r, own);
                }
                List<CompletableFuture<KeyedValues>> earlier = new ArrayList<>();
                for (int h : horizons) {
                    earlier.add(samples.get(t - h));
                }
                samples.remove(t - maxH);
                boolean correlate = earlier.stream().anyMatch(java.util.Objects::nonNull);
                if (own == null && !correlate) {
                    continue;
                }
                // the sorts and the horizons' correlations run on the study threads; a task only waits for samples
                // of tasks submitted before it, which the pool (first in, first out) has already started
                int cell = t - first; // the cell of horizon h is cell - h
                pairs.submit(() -> {
                    if (own != null) {
                        try {
                            own.complete(signalSample(def, rows, signalValues, method));
                        } catch (RuntimeException | Error e) {
                            own.completeExceptionally(e);
                            throw e;
                        }
                    }
                    if (correlate) {
                        KeyedValues returns = returnSample(rows, method);
                        for (int k = 0; k < earlier.size(); k++) {
                            if (earlier.get(k) != null) {
                                ic.get(k)[cell - horizons.get(k)] = KeyedValues.correlation(earlier.get(k).join(), returns,
                                        method, request.minSecurities());
                            }
                        }
                    }
                    return null;
                });
            }
            pairs.finish();
        }
        List<EstimateSeries> summary = new ArrayList<>();
        for (double[] row : ic) {
            summary.add(EstimateSeries.of(Arrays.stream(row).filter(x -> !Double.isNaN(x)).toArray()));
        }
        return new Result(v, request.method(), horizons, dates, ic, summary);
    }

    private static boolean inRange(LocalDate d, LocalDate from, LocalDate to) {
        return (from == null || !d.isBefore(from)) && (to == null || !d.isAfter(to));
    }

    /** The securities (increasing ids) eligible at a formation and their signal values. */
    private static KeyedValues signalSample(FactorDefinition def, CrossSection rows, double[] signal, Correlations.Method method) {
        int[] eligible = SampleRows.withSignal(def, rows, signal);
        int[] ids = new int[eligible.length];
        double[] values = new double[eligible.length];
        for (int k = 0; k < eligible.length; k++) {
            ids[k] = rows.securityIds()[eligible[k]];
            values[k] = signal[eligible[k]];
        }
        return KeyedValues.of(ids, values, method);
    }

    /** The securities (increasing ids) with a return at a date, and those returns. */
    private static KeyedValues returnSample(CrossSection rows, Correlations.Method method) {
        double[] returns = rows.returns();
        int[] ids = new int[returns.length];
        double[] values = new double[returns.length];
        int n = 0;
        for (int i = 0; i < returns.length; i++) {
            if (Double.isFinite(returns[i])) {
                ids[n] = rows.securityIds()[i];
                values[n++] = returns[i];
            }
        }
        return KeyedValues.of(Arrays.copyOf(ids, n), Arrays.copyOf(values, n), method);
    }
}
