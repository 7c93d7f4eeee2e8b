package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Builds a factor's return series from a panel, or continues a previous build from its {@link EngineState}.
 *
 * <p>Construction rules: the panel's sorted distinct dates are the period grid; a formation at rebalance point R
 * (see {@link RebalanceCalendar}) uses the rows at R - (lag - 1) and holds for periods R+1 through the next
 * rebalance point, members' values drifting by (1 + r) each period; a member without a return leaves for the rest
 * of its holding period. A portfolio's period return is sum(v_i r_i) / sum(v_i) over members with a return, values
 * before the period's drift. The net return of a holding's first period is the spread minus
 * costBps / 10,000 x the formation's turnover; if that first period has no return, that cost is not charged.
 *
 * <p>The signal is a {@link Recipe} evaluated at R - (lag - 1) by a {@link SignalEvaluator}; a security is eligible
 * only with a row there. The panel is read in date order, holding only the last {@code lag} cross-sections (and the
 * columns the recipe reads over its lookback). A resumed build first re-reads the {@code lag} + lookback dates before
 * its start; since every recipe value is a pure function of that window, appending dates and resuming gives
 * bit-for-bit the series of a build over all dates at once.
 */
public final class FactorEngine {
    private FactorEngine() {
    }

    /**
     * Builds on the caller's thread alone ({@link FormingThreads#NONE}).
     *
     * @param def           a buildable definition (not EXTERNAL); checked by {@link DefinitionValidator}
     * @param panel         the panel; when resuming, its grid must start with the grid the state was built on
     * @param riskFree      the series named by {@code def.riskFree()}, or null when the definition names none
     * @param resume        the end state of an earlier build of the same definition, or null to build from scratch
     * @return the observations and formations after the state's last processed date, and the new end state
     */
    public static BuildResult build(FactorDefinition def, PanelSource panel, ReturnSeries riskFree, EngineState resume) {
        return build(def, panel, riskFree, Map.of(), resume, FormingThreads.NONE);
    }

    /**
     * As {@link #build(FactorDefinition, PanelSource, ReturnSeries, EngineState)}, for a signal recipe that reads
     * factors ({@code trailing_beta}): {@code signalFactors} gives the return series of each factor in
     * {@code def.signal().factors()}.
     */
    public static BuildResult build(FactorDefinition def, PanelSource panel, ReturnSeries riskFree,
                                    Map<String, ReturnSeries> signalFactors, EngineState resume) {
        return build(def, panel, riskFree, signalFactors, resume, FormingThreads.NONE);
    }

    /**
     * As {@link #build(FactorDefinition, PanelSource, ReturnSeries, Map, EngineState)}; a build of at least
     * {@value #FORMED_AHEAD_MIN_DATES} dates makes its formations on one of the {@code forming} threads, ahead of the
     * caller's thread, which holds the book. The result is the same bits as on one thread.
     */
    public static BuildResult build(FactorDefinition def, PanelSource panel, ReturnSeries riskFree,
                                    Map<String, ReturnSeries> signalFactors, EngineState resume, FormingThreads forming) {
        Objects.requireNonNull(forming, "forming");
        DefinitionValidator.requireBuildable(def);
        Objects.requireNonNull(panel, "panel");
        if (def.riskFree() != null && riskFree == null) {
            throw new IllegalArgumentException("definition subtracts risk-free factor '" + def.riskFree()
                    + "': pass its return series");
        }
        if (def.riskFree() == null && riskFree != null) {
            throw new IllegalArgumentException("a risk-free series was passed but the definition names no risk_free factor");
        }
        List<LocalDate> dates = panel.dates();
        if (resume != null) {
            checkResumable(def, dates, resume);
        }
        return new Run(def, panel, dates, riskFree, signalFactors, resume).execute(forming);
    }

    /**
     * What a factor holds at grid date {@code dateIndex}: the legs of the latest formation at or before that date
     * (a formation dated R is made on the rows at R - (lag - 1); one dated at {@code dateIndex} itself is seen when the
     * next grid date exists), with each security's leg weight at formation and that weight drifted through the end of
     * the date (members without a return leave, the others renormalised within their sub-portfolio, then combined
     * with the leg's coefficients, as for turnover). Null when no formation happened by then.
     *
     * @param resume a state to start from whose processed dates do not pass {@link #latestFormation}'s index + 1
     *               (a stored checkpoint), or null to start from the first date
     */
    public static Holdings holdings(FactorDefinition def, PanelSource panel, ReturnSeries riskFree,
                                    Map<String, ReturnSeries> signalFactors, EngineState resume, int dateIndex) {
        DefinitionValidator.requireBuildable(def);
        List<LocalDate> dates = panel.dates();
        if (dateIndex < 0 || dateIndex >= dates.size()) {
            throw new IllegalArgumentException("grid index " + dateIndex + " is outside the panel's " + dates.size() + " dates");
        }
        if (resume != null) {
            checkResumable(def, dates, resume);
            if (resume.processedDates() > dateIndex + 1) {
                throw new IllegalArgumentException("resume state is past the holdings date; start from an earlier one");
            }
        }
        return new Run(def, panel, dates, riskFree, signalFactors, resume).holdingsAt(dateIndex);
    }

    /** The grid index of the latest formation dated at or before {@code dateIndex}, or -1 when there is none. */
    public static int latestFormation(FactorDefinition def, List<LocalDate> dates, int dateIndex) {
        RebalanceCalendar calendar = new RebalanceCalendar(def.effectiveRebalance(), def.rebalanceMonth());
        int lag = def.effectiveLag();
        for (int r = Math.min(dateIndex, dates.size() - 2); r >= 0 && r - (lag - 1) >= 0; r--) {
            if (calendar.isRebalancePoint(dates.get(r), dates.get(r + 1))) {
                return r;
            }
        }
        return -1;
    }

    /** One factor of {@link #buildTogether}: its definition and the series it reads. */
    public record Member(FactorDefinition definition, ReturnSeries riskFree, Map<String, ReturnSeries> signalFactors) {
    }

    /**
     * Builds several factors on the same panel from scratch in one pass over it: each cross-section is read once and
     * each distinct signal recipe is evaluated once for all the factors that use it, at each grid date. Each result
     * (series, formations, end state, and the checkpoints every {@code segmentDates} grid dates) is the same, bit for
     * bit, as {@link CheckpointedBuild#run} of that factor alone.
     *
     * @param progress called with the number of grid dates processed after each one (may be null)
     */
    public static List<CheckpointedBuild.Result> buildTogether(List<Member> members, PanelSource panel, int segmentDates,
                                                               java.util.function.IntConsumer progress) {
        if (segmentDates < 1) {
            throw new IllegalArgumentException("checkpoint segments need at least 1 grid date, got " + segmentDates);
        }
        List<LocalDate> dates = panel.dates();
        int maxLag = 1;
        Map<String, ReturnSeries> factors = new HashMap<>();
        for (Member m : members) {
            FactorDefinition def = m.definition();
            DefinitionValidator.requireBuildable(def);
            if ((def.riskFree() == null) != (m.riskFree() == null)) {
                throw new IllegalArgumentException("pass the risk-free series exactly when the definition names one");
            }
            maxLag = Math.max(maxLag, def.effectiveLag());
            factors.putAll(m.signalFactors());
        }
        Map<Recipe, SignalEvaluator> pool = new java.util.LinkedHashMap<>();
        for (Member m : members) {
            FactorDefinition def = m.definition();
            for (Recipe r : new Recipe[] {def.signal(), def.control() == null ? null : def.control().signal()}) {
                if (r != null && !pool.containsKey(r)) {
                    pool.put(r, new SignalEvaluator(r, factors, maxLag - 1));
                }
            }
        }
        CurrentRows source = new CurrentRows(panel);
        List<Run> runs = new ArrayList<>();
        List<List<CheckpointedBuild.Checkpoint>> checkpoints = new ArrayList<>();
        for (Member m : members) {
            Run run = new Run(m.definition(), source, dates, m.riskFree(), m.signalFactors(), null, pool);
            run.prime();
            runs.add(run);
            checkpoints.add(new ArrayList<>());
        }
        for (int t = 0; t < dates.size(); t++) {
            CrossSection rows = panel.crossSection(t);
            source.set(t, rows);
            for (int i = 0; i < runs.size(); i++) {
                Run run = runs.get(i);
                run.step(t);
                if ((t + 1) % segmentDates == 0) {
                    checkpoints.get(i).add(new CheckpointedBuild.Checkpoint(run.stateAfter(t), run.observations.size(),
                            run.withoutReturn));
                }
            }
            // after the formations, which read signals up to t - 1, as a single build offers them
            for (SignalEvaluator e : pool.values()) {
                e.offer(t, rows);
            }
            if (progress != null) {
                progress.accept(t + 1);
            }
        }
        List<CheckpointedBuild.Result> out = new ArrayList<>();
        for (int i = 0; i < runs.size(); i++) {
            Run run = runs.get(i);
            BuildResult build = new BuildResult(run.observations, run.formations, run.stateAfter(dates.size() - 1),
                    run.withoutReturn, run.portfolioObservations);
            out.add(new CheckpointedBuild.Result(build, checkpoints.get(i)));
        }
        return out;
    }

    /** The panel with the cross-section being processed held, so that every factor of a shared pass reads it once. */
    private static final class CurrentRows implements PanelSource {
        private final PanelSource panel;
        private int index = -1;
        private CrossSection rows;

        CurrentRows(PanelSource panel) {
            this.panel = panel;
        }

        void set(int i, CrossSection r) {
            index = i;
            rows = r;
        }

        @Override
        public List<LocalDate> dates() {
            return panel.dates();
        }

        @Override
        public CrossSection crossSection(int i) {
            return i == index ? rows : panel.crossSection(i);
        }
    }

    /** The names of the portfolios a definition's builds store, in order (empty for market and external). */
    public static List<String> portfolioNames(FactorDefinition def) {
        if (def.method() == null || def.method() == FactorDefinition.Method.EXTERNAL) {
            return List.of();
        }
        return PortfolioRule.of(def).portfolios().stream().map(PortfolioRule.Portfolio::name).toList();
    }

    private static void checkResumable(FactorDefinition def, List<LocalDate> dates, EngineState state) {
        if (!state.definitionKey().equals(def.constructionKey())) {
            throw new IllegalArgumentException("resume state was built for another definition; rebuild from scratch");
        }
        int n = state.processedDates();
        if (n > dates.size() || (n > 0 && !dates.get(n - 1).equals(state.lastProcessedDate()))) {
            throw new IllegalArgumentException("resume state ends at grid date #" + n + " = " + state.lastProcessedDate()
                    + ", which the panel's dates no longer match; rebuild from scratch");
        }
    }

    /**
     * Builds over at least this many dates form ahead on a forming thread, when given {@link FormingThreads}
     * ({@code Run.executeFormingAhead}).
     */
    static final int FORMED_AHEAD_MIN_DATES = 64;

    /** How many dates the forming thread may run ahead of the thread that holds the book. */
    private static final int FORMED_AHEAD = 16;

    /** One pass over the grid from the start index to the end. */
    private static final class Run {
        private final PanelSource panel;
        private final List<LocalDate> dates;
        private final Map<LocalDate, Double> riskFree;
        private final PortfolioRule rule;
        private final RebalanceCalendar calendar;
        private final int lag;
        private final SignalEvaluator signal;
        private final SignalEvaluator control;
        private final boolean shared;
        private final double costRate;
        private final String key;
        private final int start;
        private Holding[] book;
        /** Scratch: the current cross-section's row of each security id, shared by the sub-portfolios. */
        private int[] rowIndex;
        private final List<FactorObservation> observations = new ArrayList<>();
        private final List<Formation> formations = new ArrayList<>();
        private final List<PortfolioObservation> portfolioObservations = new ArrayList<>();
        private final List<PortfolioRule.Portfolio> portfolios;
        private int withoutReturn;

        Run(FactorDefinition def, PanelSource panel, List<LocalDate> dates, ReturnSeries riskFree,
            Map<String, ReturnSeries> signalFactors, EngineState resume) {
            this(def, panel, dates, riskFree, signalFactors, resume, null);
        }

        /** With {@code sharedSignals}, the signal evaluators come from that pool, which its owner feeds. */
        Run(FactorDefinition def, PanelSource panel, List<LocalDate> dates, ReturnSeries riskFree,
            Map<String, ReturnSeries> signalFactors, EngineState resume, Map<Recipe, SignalEvaluator> sharedSignals) {
            this.panel = panel;
            this.dates = dates;
            this.riskFree = riskFree == null ? null : byDate(riskFree);
            this.rule = PortfolioRule.of(def);
            this.portfolios = rule.portfolios();
            this.calendar = new RebalanceCalendar(def.effectiveRebalance(), def.rebalanceMonth());
            this.lag = def.effectiveLag();
            this.shared = sharedSignals != null;
            this.signal = def.signal() == null ? null : shared ? sharedSignals.get(def.signal())
                    : new SignalEvaluator(def.signal(), signalFactors, lag - 1);
            this.control = def.control() == null ? null : shared ? sharedSignals.get(def.control().signal())
                    : new SignalEvaluator(def.control().signal(), signalFactors, lag - 1);
            this.costRate = def.effectiveCostBps() / 10_000.0;
            this.key = def.constructionKey();
            this.start = resume == null ? 0 : resume.processedDates();
            this.book = resume == null ? null : resume.holdings();
        }

        private LagWindow window;
        /** When set, each formation's leg weights at formation (before any drift) are kept in {@link #lastFormed}. */
        private boolean trackFormations;
        private LegWeights[] lastFormed;

        BuildResult execute(FormingThreads forming) {
            if (dates.size() - start < FORMED_AHEAD_MIN_DATES || !executeFormingAhead(forming)) {
                prime();
                for (int t = start; t < dates.size(); t++) {
                    step(t);
                }
            }
            int processed = dates.size();
            EngineState end = new EngineState(key, processed, processed == 0 ? null : dates.get(processed - 1), book);
            return new BuildResult(observations, formations, end, withoutReturn, portfolioObservations);
        }

        /** The state after processing grid dates 0..t (t = -1: none). */
        EngineState stateAfter(int t) {
            return new EngineState(key, t + 1, t < 0 ? null : dates.get(t), book);
        }

        /** Re-reads the dates before the start that the lag and the signals' lookback need. */
        private void prime() {
            window = new LagWindow(lag);
            int history = lag + Math.max(signal == null ? 0 : signal.lookback(), control == null ? 0 : control.lookback());
            for (int i = Math.max(0, start - history); i < start; i++) {
                CrossSection rows = read(i);
                if (i >= start - lag) {
                    window.put(i, rows);
                }
                offer(i, rows);
            }
        }

        /** Processes grid date t: the formation dated t - 1 if it is a rebalance point, then one holding period. */
        private boolean step(int t) {
            CrossSection rows = read(t);
            boolean formed = formsAt(t);
            advance(t, rows, formed ? form(t) : null);
            window.put(t, rows);
            offer(t, rows);
            return formed;
        }

        /**
         * What depends on the book at grid date t: the formation that starts the date, when {@code next} is one (its
         * turnover and cost, and it becomes the book), then the holding period through t.
         */
        private void advance(int t, CrossSection rows, Holding[] next) {
            double cost = 0.0;
            if (next != null) {
                double turnover = LegWeights.turnover(rule, next, book);
                formations.add(new Formation(dates.get(t - 1), turnover));
                cost = costRate * turnover;
                book = next;
                if (trackFormations) {
                    lastFormed = legs(next);
                }
            }
            if (book != null) {
                hold(rows, cost);
            }
        }

        /** What the forming thread hands over for grid date t: its rows and the formation it starts with, if any. */
        private record Formed(CrossSection rows, Holding[] next, Throwable failure) {
        }

        /**
         * The same steps as {@link #step} for every date, split over two threads: a forming thread reads the panel in
         * date order, feeds the lag window and the signal evaluators and makes each formation (all of which depend
         * only on the rows and signals before the date, never on what is held), while this thread takes them in
         * order and does what depends on the book: turnover, the holding period's returns and the drift. Each
         * computation is the one {@link #step} does on the same values, so the results are the same bits. The
         * forming thread runs at most {@value #FORMED_AHEAD} dates ahead, and stops when this thread fails: told by
         * a flag, never by an interrupt, since an interrupt that meets the panel's store inside a file read closes
         * the store's file.
         *
         * @return false, having done nothing, when {@code threads} has no thread to give (the caller builds on one)
         */
        private boolean executeFormingAhead(FormingThreads threads) {
            java.util.concurrent.BlockingQueue<Formed> handOver = new java.util.concurrent.ArrayBlockingQueue<>(FORMED_AHEAD);
            java.util.concurrent.atomic.AtomicBoolean abandoned = new java.util.concurrent.atomic.AtomicBoolean();
            java.util.concurrent.Future<?> forming = threads.start(() -> {
                try {
                    prime();
                    for (int t = start; t < dates.size() && !abandoned.get(); t++) {
                        CrossSection rows = read(t);
                        Holding[] next = formsAt(t) ? form(t) : null;
                        window.put(t, rows);
                        offer(t, rows);
                        Formed f = new Formed(rows, next, null);
                        while (!abandoned.get() && !handOver.offer(f, 100, java.util.concurrent.TimeUnit.MILLISECONDS)) {
                            // the holding thread is behind; wait for room unless it gave up
                        }
                    }
                } catch (InterruptedException stopped) {
                    Thread.currentThread().interrupt();
                } catch (Throwable e) {
                    Formed failed = new Formed(null, null, e);
                    try {
                        while (!abandoned.get() && !handOver.offer(failed, 100, java.util.concurrent.TimeUnit.MILLISECONDS)) {
                            // the holding thread takes what came before, then this failure
                        }
                    } catch (InterruptedException stopped) {
                        Thread.currentThread().interrupt();
                    }
                }
            });
            if (forming == null) {
                return false;
            }
            boolean done = false;
            try {
                for (int t = start; t < dates.size(); t++) {
                    Formed f;
                    while ((f = handOver.poll(100, java.util.concurrent.TimeUnit.MILLISECONDS)) == null) {
                        if (forming.isDone() && handOver.isEmpty()) {
                            forming.get(); // its failure, if it ended by one it could not hand over
                            throw new IllegalStateException("the forming thread ended before grid date #" + t);
                        }
                    }
                    if (f.failure() instanceof RuntimeException r) {
                        throw r;
                    }
                    if (f.failure() instanceof Error err) {
                        throw err;
                    }
                    if (f.failure() != null) {
                        throw new IllegalStateException(f.failure());
                    }
                    advance(t, f.rows(), f.next());
                }
                forming.get(); // its last steps happen before this build's end
                done = true;
                return true;
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted while building", e);
            } catch (java.util.concurrent.ExecutionException e) {
                throw new IllegalStateException(e.getCause());
            } finally {
                if (!done) {
                    abandoned.set(true);
                }
            }
        }

        /** Whether processing grid date t starts with a formation (dated t - 1). */
        private boolean formsAt(int t) {
            return t >= 1 && t - lag >= 0 && calendar.isRebalancePoint(dates.get(t - 1), dates.get(t));
        }

        /** The formation dated t - 1, on the rows and signals at t - lag. */
        private Holding[] form(int t) {
            return rule.form(window.get(t - lag), signal == null ? null : signal.valueAt(t - lag),
                    control == null ? null : control.valueAt(t - lag));
        }

        /** The latest formation at or before grid date d and its legs drifted through the end of d; null if none. */
        Holdings holdingsAt(int d) {
            prime();
            trackFormations = true;
            LegWeights[] formed = null;
            LocalDate formedOn = null;
            for (int t = start; t <= d; t++) {
                if (step(t)) {
                    formed = lastFormed;
                    formedOn = dates.get(t - 1);
                }
            }
            if (d + 1 < dates.size() && formsAt(d + 1)) {
                LegWeights[] atFormation = legs(form(d + 1));
                return Holdings.of(dates.get(d), dates.get(d), atFormation, atFormation);
            }
            if (formed == null) {
                return null;
            }
            return Holdings.of(dates.get(d), formedOn, formed, legs(book));
        }

        private LegWeights[] legs(Holding[] holdings) {
            return new LegWeights[] {LegWeights.of(holdings, rule.longLeg()),
                rule.shortLeg().length == 0 ? null : LegWeights.of(holdings, rule.shortLeg())};
        }

        /** Hands a cross-section to the signal evaluators; earlier offers may start anywhere before it. */
        private void offer(int index, CrossSection rows) {
            if (shared) {
                return;
            }
            if (signal != null && index >= start - lag - signal.lookback()) {
                signal.offer(index, rows);
            }
            if (control != null && index >= start - lag - control.lookback()) {
                control.offer(index, rows);
            }
        }

        private CrossSection read(int index) {
            CrossSection rows = panel.crossSection(index);
            if (!rows.date().equals(dates.get(index))) {
                throw new IllegalArgumentException("panel returned the rows of " + rows.date() + " for grid date #"
                        + index + " = " + dates.get(index));
            }
            return rows;
        }

        /** One period of the current holding: returns, drift, and the observation if the factor has a return. */
        private void hold(CrossSection rows, double cost) {
            double[] subReturns = new double[book.length];
            int[] rowOf = book.length > 1 ? Holding.rowIndex(rows, rowIndex) : null;
            if (rowOf != null) {
                rowIndex = rowOf;
            }
            for (int s = 0; s < book.length; s++) {
                subReturns[s] = book[s].holdThrough(rows, rowOf);
            }
            double longLeg = legMean(subReturns, rule.longLeg());
            double shortLeg = legMean(subReturns, rule.shortLeg());
            double spread;
            if (rule.shortLeg().length > 0) {
                spread = longLeg - shortLeg;
            } else if (riskFree != null) {
                Double rf = riskFree.get(rows.date());
                spread = rf == null ? Double.NaN : longLeg - rf;
            } else {
                spread = longLeg;
            }
            if (Double.isNaN(spread)) {
                withoutReturn++;
            } else {
                observations.add(new FactorObservation(rows.date(), spread, longLeg, shortLeg, spread - cost));
            }
            if (!portfolios.isEmpty()) {
                double[] returns = new double[portfolios.size()];
                boolean any = false;
                for (int k = 0; k < returns.length; k++) {
                    returns[k] = legMean(subReturns, portfolios.get(k).subs());
                    any |= !Double.isNaN(returns[k]);
                }
                if (any) {
                    portfolioObservations.add(new PortfolioObservation(rows.date(), returns));
                }
            }
        }

        /** Equal-coefficient mean of the leg's sub-portfolio returns; NaN if any is missing or the leg is empty. */
        private static double legMean(double[] subReturns, int[] leg) {
            if (leg.length == 0) {
                return Double.NaN;
            }
            double sum = 0.0;
            for (int s : leg) {
                sum += subReturns[s];
            }
            return sum / leg.length;
        }

        private static Map<LocalDate, Double> byDate(ReturnSeries series) {
            Map<LocalDate, Double> map = new HashMap<>();
            for (int i = 0; i < series.size(); i++) {
                map.put(series.date(i), series.value(i));
            }
            return map;
        }
    }
}
