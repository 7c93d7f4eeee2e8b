package dev.winnow.construct;

import java.time.LocalDate;
import java.util.Map;
import java.util.StringJoiner;

/**
 * How to build one factor. Optional fields are null when not given, so that {@link DefinitionValidator} can tell
 * a field given to a method it does not apply to; the {@code effective...} accessors supply the defaults.
 *
 * @param method          how the series is obtained; EXTERNAL series are uploaded, not built
 * @param panel           panel name (not for EXTERNAL)
 * @param signal          what to sort on: a numeric column or a {@link Recipe} (SORT and SIZE_SORT)
 * @param direction       which end is long; default HIGH_MINUS_LOW
 * @param buckets         number of sort buckets, 2..20; default 5 (SORT only)
 * @param weighting       weights inside a portfolio; default EQUAL for SORT, CAP otherwise
 * @param lag             formation at rebalance point R uses the rows at R - (lag - 1); at least 1, default 1
 * @param rebalance       rebalance calendar; default EVERY_PERIOD
 * @param rebalanceMonth  month 1..12 of the yearly rebalance (ANNUAL only, required there)
 * @param output          SIGNAL (default) or SIZE leg of the 2x3 sort (SIZE_SORT only)
 * @param riskFree        name of the factor subtracted from the market return (MARKET only)
 * @param universe        eligibility restrictions; default none
 * @param breakpoints     compute breakpoints on the eligible securities whose label matches (SORT, SIZE_SORT)
 * @param within          label column inside whose groups a SORT computes its breakpoints
 * @param control         the control signal and bucket count of a dependent double SORT
 * @param costBps         one-way trading cost in basis points charged on turnover; default 0
 * @param theme           free text
 * @param rationale       free text
 * @param foundOn         when the idea was found, if known
 * @param role            FACTOR (a candidate premium) or INPUT (a series other factors and studies read); null when
 *                        not declared, see {@link #declaredRole()}
 */
public record FactorDefinition(
        Method method,
        String panel,
        Recipe signal,
        Direction direction,
        Integer buckets,
        Weighting weighting,
        Integer lag,
        Rebalance rebalance,
        Integer rebalanceMonth,
        Output output,
        String riskFree,
        Universe universe,
        LabelEquals breakpoints,
        String within,
        Control control,
        Double costBps,
        String theme,
        String rationale,
        LocalDate foundOn,
        Role role) {

    public enum Method {
        SORT,
        SIZE_SORT,
        MARKET,
        RANK_WEIGHTED,
        EXTERNAL
    }

    /** A dependent double sort's first sort: on {@code signal} into {@code buckets} (2..10) buckets. */
    public record Control(Recipe signal, int buckets) {
    }

    public enum Direction {
        HIGH_MINUS_LOW,
        LOW_MINUS_HIGH
    }

    public enum Weighting {
        EQUAL,
        CAP
    }

    public enum Rebalance {
        EVERY_PERIOD,
        MONTHLY,
        QUARTERLY,
        ANNUAL
    }

    public enum Output {
        SIGNAL,
        SIZE
    }

    /**
     * What the series is for. A FACTOR is a candidate premium: a trial of the evidence table. An INPUT (a risk-free
     * rate, a benchmark, a macro series used only as a regressor) is served and usable everywhere but is no trial.
     */
    public enum Role {
        FACTOR,
        INPUT
    }

    public static final int DEFAULT_BUCKETS = 5;

    public Direction effectiveDirection() {
        return direction != null ? direction : Direction.HIGH_MINUS_LOW;
    }

    public int effectiveBuckets() {
        return buckets != null ? buckets : DEFAULT_BUCKETS;
    }

    public Weighting effectiveWeighting() {
        if (weighting != null) {
            return weighting;
        }
        return method == Method.SORT || method == Method.RANK_WEIGHTED ? Weighting.EQUAL : Weighting.CAP;
    }

    public int effectiveLag() {
        return lag != null ? lag : 1;
    }

    public Rebalance effectiveRebalance() {
        return rebalance != null ? rebalance : Rebalance.EVERY_PERIOD;
    }

    public Output effectiveOutput() {
        return output != null ? output : Output.SIGNAL;
    }

    /** The role as declared, or null: an undeclared role is decided by the library (see research.FactorRoles). */
    public Role declaredRole() {
        return role;
    }

    public Universe effectiveUniverse() {
        return universe != null ? universe : Universe.ALL;
    }

    public double effectiveCostBps() {
        return costBps != null ? costBps : 0.0;
    }

    /**
     * Canonical text of every field that affects the built series, with defaults filled in: two definitions with
     * equal keys build identical series. Free text (theme, rationale, found-on date) and the role are left out.
     */
    public String constructionKey() {
        StringJoiner key = new StringJoiner(";");
        key.add("method=" + method).add("panel=" + panel).add("signal=" + signalKey())
                .add("direction=" + effectiveDirection()).add("buckets=" + effectiveBuckets())
                .add("weighting=" + effectiveWeighting()).add("lag=" + effectiveLag())
                .add("rebalance=" + effectiveRebalance()).add("rebalance_month=" + rebalanceMonth)
                .add("output=" + effectiveOutput()).add("risk_free=" + riskFree)
                .add("cost_bps=" + Double.toHexString(effectiveCostBps()));
        Universe u = effectiveUniverse();
        key.add("min_market_cap=" + (u.minMarketCap() == null ? "null" : Double.toHexString(u.minMarketCap())));
        for (Map.Entry<String, LabelFilter> f : u.labelFilters().entrySet()) {
            key.add("filter=" + f.getKey() + ":" + f.getValue().mode() + ":" + String.join("|", f.getValue().values()));
        }
        key.add("size_half=" + u.sizeHalf()).add("segment=" + u.segment()).add("breakpoints=" + breakpoints);
        // added with signal recipes; left out when unset so that earlier versions keep their keys
        if (within != null) {
            key.add("within=" + within);
        }
        if (control != null) {
            key.add("control=" + (control.signal() == null ? "null" : RecipeJson.canonical(control.signal())) + ":" + control.buckets());
        }
        return key.toString();
    }

    /**
     * The panel columns besides return and market_cap that building this definition reads: those of the signal and
     * control recipes, the {@code within} column, the label columns of universe filters and segment, and the
     * breakpoint subset's column. A panel source may leave every other column out.
     */
    public java.util.Set<String> columnsRead() {
        java.util.Set<String> columns = new java.util.TreeSet<>();
        for (Recipe recipe : new Recipe[] {signal, control == null ? null : control.signal()}) {
            if (recipe != null) {
                columns.addAll(recipe.numberColumns());
                columns.addAll(recipe.labelColumns());
            }
        }
        if (within != null) {
            columns.add(within);
        }
        columns.addAll(effectiveUniverse().labelColumns());
        if (breakpoints != null) {
            columns.add(breakpoints.column());
        }
        return columns;
    }

    /**
     * The signal's part of the construction key: the column name for a plain column (so a column spelled as a string
     * or as {@code {"column": ...}} keys alike, as versions built before recipes did), else the canonical recipe.
     */
    private String signalKey() {
        if (signal == null) {
            return "null";
        }
        return signal.columnName() != null ? signal.columnName() : RecipeJson.canonical(signal);
    }

    /** The factors whose returns the build reads: the risk_free rate, then those the signal recipes name. */
    public java.util.Set<String> factorsRead() {
        java.util.Set<String> names = new java.util.LinkedHashSet<>();
        if (riskFree != null) {
            names.add(riskFree);
        }
        names.addAll(recipeFactors());
        return names;
    }

    /** The factors the signal and control recipes read (trailing_beta's {@code against}). */
    public java.util.Set<String> recipeFactors() {
        java.util.Set<String> names = new java.util.LinkedHashSet<>();
        if (signal != null) {
            names.addAll(signal.factors());
        }
        if (control != null && control.signal() != null) {
            names.addAll(control.signal().factors());
        }
        return names;
    }

    /** The same definition restricted to another universe (all other fields unchanged). */
    public FactorDefinition withUniverse(Universe value) {
        return new FactorDefinition(method, panel, signal, direction, buckets, weighting, lag, rebalance, rebalanceMonth,
                output, riskFree, value, breakpoints, within, control, costBps, theme, rationale, foundOn, role);
    }

    public static Builder builder(Method method) {
        return new Builder(method);
    }

    /** Mutable helper to assemble a definition field by field; unset fields stay null (= default). */
    public static final class Builder {
        private final Method method;
        private String panel;
        private Recipe signal;
        private Direction direction;
        private Integer buckets;
        private Weighting weighting;
        private Integer lag;
        private Rebalance rebalance;
        private Integer rebalanceMonth;
        private Output output;
        private String riskFree;
        private Universe universe;
        private LabelEquals breakpoints;
        private String within;
        private Control control;
        private Double costBps;
        private String theme;
        private String rationale;
        private LocalDate foundOn;
        private Role role;

        private Builder(Method method) {
            this.method = method;
        }

        public Builder panel(String value) {
            panel = value;
            return this;
        }

        /** A plain column signal (null for none). */
        public Builder signal(String column) {
            signal = column == null ? null : Recipe.column(column);
            return this;
        }

        public Builder signal(Recipe value) {
            signal = value;
            return this;
        }

        public Builder direction(Direction value) {
            direction = value;
            return this;
        }

        public Builder buckets(Integer value) {
            buckets = value;
            return this;
        }

        public Builder weighting(Weighting value) {
            weighting = value;
            return this;
        }

        public Builder lag(Integer value) {
            lag = value;
            return this;
        }

        public Builder rebalance(Rebalance value) {
            rebalance = value;
            return this;
        }

        public Builder rebalanceMonth(Integer value) {
            rebalanceMonth = value;
            return this;
        }

        public Builder output(Output value) {
            output = value;
            return this;
        }

        public Builder riskFree(String value) {
            riskFree = value;
            return this;
        }

        public Builder universe(Universe value) {
            universe = value;
            return this;
        }

        public Builder breakpoints(LabelEquals value) {
            breakpoints = value;
            return this;
        }

        public Builder within(String value) {
            within = value;
            return this;
        }

        public Builder control(Control value) {
            control = value;
            return this;
        }

        public Builder costBps(Double value) {
            costBps = value;
            return this;
        }

        public Builder theme(String value) {
            theme = value;
            return this;
        }

        public Builder rationale(String value) {
            rationale = value;
            return this;
        }

        public Builder foundOn(LocalDate value) {
            foundOn = value;
            return this;
        }

        public Builder role(Role value) {
            role = value;
            return this;
        }

        public FactorDefinition build() {
            return new FactorDefinition(method, panel, signal, direction, buckets, weighting, lag, rebalance,
                    rebalanceMonth, output, riskFree, universe, breakpoints, within, control, costBps, theme, rationale, foundOn, role);
        }
    }
}
