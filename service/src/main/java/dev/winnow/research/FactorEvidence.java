package dev.winnow.research;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.store.VersionStatus;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorEngine;
import dev.winnow.research.TrialLibrary.Snapshot;
import dev.winnow.research.TrialLibrary.Trial;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.EqualWeightComposite;
import dev.winnow.stats.EvidenceVerdicts;
import dev.winnow.stats.EvidenceVerdicts.Section;
import dev.winnow.stats.LiveRecord;
import dev.winnow.stats.Monotonicity;
import dev.winnow.stats.Verdict;
import dev.winnow.stats.MonthlyBasis;
import dev.winnow.stats.PeriodStatistics;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.SectionVerdict;
import dev.winnow.stats.SpanningRegression;
import dev.winnow.stats.StabilityReport;
import dev.winnow.stats.TradingCosts;
import dev.winnow.stats.TrialRow;
import dev.winnow.stats.TrialStatistics;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.SeriesSummary;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * One factor version's evidence, section by section, as the body of {@code GET /v1/factors/{f}/evidence}. All
 * sections use monthly returns; the verdict rules and thresholds are those of {@link EvidenceVerdicts}.
 */
public final class FactorEvidence {
    private final FactorStore factors;
    private final Breadth breadth;

    public FactorEvidence(FactorStore factors, Breadth breadth) {
        this.factors = factors;
        this.breadth = breadth;
    }

    /**
     * @param segmentColumn label column for breadth, or null for the size halves (already checked by the caller)
     * @param against       the factors of the spanning regression (already resolved by {@link #against})
     */
    public Map<String, Object> report(Trial trial, Snapshot library, String segmentColumn, List<Trial> against) {
        String unavailable = unavailable(trial);
        ReturnSeries monthly = trial.monthly();
        PeriodStatistics full = PeriodStatistics.of(monthly);
        FactorDefinition def = trial.definition();
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factor", trial.name());
        out.put("version", trial.version().version());
        out.put("retired", trial.version().retired());
        out.put("basis", "monthly");
        out.put("trials", library.table().trials());
        out.put("significance", significance(trial, unavailable));
        out.put("stability", stability(monthly, full, def, unavailable));
        out.put("breadth", unavailable != null
                ? EvidenceJson.section(Breadth.emptyNumbers(segmentColumn), EvidenceVerdicts.notEnoughData(Section.BREADTH, unavailable), null)
                : breadth.section(trial, segmentColumn, full.mean()));
        out.put("variants", variants(trial, library, full, unavailable));
        out.put("after_costs", afterCosts(trial, unavailable));
        String rationale = def == null ? null : def.rationale();
        Map<String, Object> text = new LinkedHashMap<>();
        text.put("text", rationale);
        out.put("rationale", EvidenceJson.section(text, EvidenceVerdicts.rationale(rationale), null));
        out.put("redundancy", redundancy(monthly, against, unavailable));
        out.put("monotonicity", monotonicity(trial, monthly, unavailable));
        out.put("live", live(trial, monthly, unavailable));
        return out;
    }

    /**
     * Monotonicity across the buckets of a sort factor ({@link Monotonicity}) on the monthly basis; other methods have
     * no buckets and get not_enough_data.
     */
    private Map<String, Object> monotonicity(Trial trial, ReturnSeries monthly, String unavailable) {
        FactorDefinition def = trial.definition();
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("buckets", List.of());
        numbers.put("steps", List.of());
        numbers.put("steps_in_direction", 0);
        numbers.put("min_step_t", Double.NaN);
        numbers.put("rank_correlation", Double.NaN);
        if (def == null || def.method() != FactorDefinition.Method.SORT) {
            return EvidenceJson.section(numbers, new SectionVerdict(Verdict.NOT_ENOUGH_DATA, Monotonicity.thresholds(),
                    "Only sort factors have buckets to compare; this is a " + DefinitionJson.wire(trial.version().method()) + " factor."), unavailable);
        }
        if (unavailable != null) {
            return EvidenceJson.section(numbers, new SectionVerdict(Verdict.NOT_ENOUGH_DATA, Monotonicity.thresholds(), unavailable), unavailable);
        }
        Map<String, ReturnSeries> stored = factors.portfolios(trial.version().factorId(), trial.version().version());
        List<ReturnSeries> buckets = new ArrayList<>();
        for (String name : FactorEngine.portfolioNames(def)) {
            buckets.add(MonthlyBasis.of(stored.getOrDefault(name, ReturnSeries.empty())).monthly());
        }
        Monotonicity.Result r = Monotonicity.of(buckets, def.effectiveDirection() == FactorDefinition.Direction.HIGH_MINUS_LOW,
                PeriodStatistics.of(monthly).nwTStat());
        List<Map<String, Object>> bucketRows = new ArrayList<>();
        for (Monotonicity.Bucket b : r.buckets()) {
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("bucket", b.bucket());
            row.put("n", b.n());
            row.put("mean", b.mean());
            row.put("nw_t_stat", b.nwTStat());
            bucketRows.add(row);
        }
        List<Map<String, Object>> stepRows = new ArrayList<>();
        for (Monotonicity.Step st : r.steps()) {
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("from", st.from());
            row.put("to", st.to());
            row.put("n", st.n());
            row.put("mean", st.mean());
            row.put("nw_t_stat", st.nwTStat());
            stepRows.add(row);
        }
        numbers.put("buckets", bucketRows);
        numbers.put("steps", stepRows);
        numbers.put("steps_in_direction", r.stepsInDirection());
        numbers.put("min_step_t", r.minStepT());
        numbers.put("rank_correlation", r.rankCorrelation());
        return EvidenceJson.section(numbers, r.verdict(), null);
    }

    /** The live record: months ending after the day Winnow recorded this version's definition, against those before. */
    private static Map<String, Object> live(Trial trial, ReturnSeries monthly, String unavailable) {
        java.time.OffsetDateTime definedAt = trial.version().createdAt();
        LiveRecord.Result record = LiveRecord.of(monthly, definedAt.atZoneSameInstant(java.time.ZoneOffset.UTC).toLocalDate());
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("defined_at", definedAt);
        numbers.put("before", liveSide(record.before()));
        numbers.put("after", liveSide(record.after()));
        numbers.put("mean_ratio", record.meanRatio());
        return EvidenceJson.section(numbers, record.verdict(), unavailable);
    }

    private static Map<String, Object> liveSide(LiveRecord.Side side) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("n", side.n());
        out.put("mean", side.mean());
        out.put("nw_t_stat", side.nwTStat());
        out.put("sharpe_monthly", side.sharpeMonthly());
        return out;
    }

    /**
     * The factors of the spanning regression: those named (each must be another live factor on the monthly basis),
     * or by default every other live factor with at least min_months months in common with this one, inputs and
     * risk-free rates left out (a near-constant regressor is almost collinear with the intercept).
     */
    public static List<Trial> against(Trial trial, Snapshot library, List<String> named) {
        List<Trial> live = library.live();
        List<Trial> out = new ArrayList<>();
        if (named == null) {
            for (Trial other : live) {
                if (!other.name().equals(trial.name()) && other.premium()
                        && SpanningRegression.commonDates(trial.monthly(), other.monthly()) >= EvidenceVerdicts.MIN_MONTHS) {
                    out.add(other);
                }
            }
            return out;
        }
        if (named.stream().distinct().count() != named.size()) {
            throw new InvalidRequestException("Query parameter 'against' names a factor twice; list each once.");
        }
        for (String name : named) {
            if (name.equals(trial.name())) {
                throw new InvalidRequestException("'against' names the factor itself; list the other factors to regress it on.");
            }
            Trial other = live.stream().filter(t -> t.name().equals(name)).findFirst()
                    .orElseThrow(() -> new InvalidRequestException("'against' names '" + name + "', which is not a live factor; GET /v1/factors lists them."));
            if (other.excluded()) {
                throw new InvalidRequestException("'against' names '" + name + "': " + other.basis().excludedReason() + ".");
            }
            out.add(other);
        }
        return out;
    }

    private static String unavailable(Trial trial) {
        if (trial.excluded()) {
            return "The factor cannot be judged on monthly returns: " + trial.exclusionReason() + ".";
        }
        if (!trial.inTable()) {
            return "This factor is " + trial.exclusionReason() + "; it is no trial and has no evidence of its own.";
        }
        if (trial.version().status() != VersionStatus.READY) {
            return "This version's status is " + trial.version().status().wireName() + ", so it has no series yet.";
        }
        return null;
    }

    private static Map<String, Object> significance(Trial trial, String unavailable) {
        if (trial.row() == null) {
            double nan = Double.NaN;
            TrialRow undefined = new TrialRow(TrialStatistics.undefined(0), nan, nan, nan, nan, null, nan, nan);
            return EvidenceJson.section(EvidenceJson.row(trial, undefined), EvidenceVerdicts.notEnoughData(Section.SIGNIFICANCE, unavailable), null);
        }
        return EvidenceJson.section(EvidenceJson.row(trial, trial.row()), EvidenceVerdicts.significance(trial.row()), unavailable);
    }

    private static Map<String, Object> stability(ReturnSeries monthly, PeriodStatistics full, FactorDefinition def, String unavailable) {
        StabilityReport report = StabilityReport.of(monthly, EvidenceVerdicts.ROLLING_WINDOW, EvidenceVerdicts.ROLLING_T,
                def == null ? null : def.foundOn());
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("halves", report.halves().stream().map(EvidenceJson::period).toList());
        numbers.put("decades", report.decades().stream().map(EvidenceJson::period).toList());
        numbers.put("rolling_window", report.rollingWindow());
        numbers.put("share_above_2", report.shareAbove());
        Map<String, Object> split = null;
        if (report.foundOn() != null) {
            split = new LinkedHashMap<>();
            split.put("date", report.foundOn().date());
            split.put("before", EvidenceJson.period(report.foundOn().before()));
            split.put("after", EvidenceJson.period(report.foundOn().after()));
            split.put("ratio", report.foundOn().ratio());
        }
        numbers.put("found_on", split);
        return EvidenceJson.section(numbers, EvidenceVerdicts.stability(full.n(), full.mean(), report), unavailable);
    }

    private static Map<String, Object> variants(Trial trial, Snapshot library, PeriodStatistics full, String unavailable) {
        String theme = trial.theme();
        String family = trial.version().family();
        List<Trial> members = new ArrayList<>();
        members.add(trial);
        if (theme != null || family != null) {
            for (Trial other : library.live()) {
                boolean related = (theme != null && theme.equals(other.theme()))
                        || (family != null && family.equals(other.version().family()));
                if (!other.name().equals(trial.name()) && related && other.candidate()) {
                    members.add(other);
                }
            }
        }
        List<Map<String, Object>> rows = new ArrayList<>();
        double[] tStats = new double[members.size()];
        List<ReturnSeries> series = new ArrayList<>();
        for (int i = 0; i < members.size(); i++) {
            Trial m = members.get(i);
            tStats[i] = PeriodStatistics.of(m.monthly()).nwTStat();
            series.add(m.monthly());
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("factor", m.name());
            row.put("nw_t_stat", tStats[i]);
            row.put("correlation", Correlations.correlation(trial.monthly(), m.monthly(), Correlations.Method.PEARSON));
            rows.add(row);
        }
        PeriodStatistics composite = members.size() < 2 ? null : PeriodStatistics.of(EqualWeightComposite.of(series));
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("theme", theme);
        numbers.put("family", family);
        numbers.put("members", theme == null && family == null ? List.of() : rows);
        numbers.put("composite", composite == null ? null : EvidenceJson.period(composite));
        // a factor without a theme still has variants when it belongs to a family
        SectionVerdict verdict = EvidenceVerdicts.variants(theme != null ? theme : family, full.mean(), tStats, composite);
        return EvidenceJson.section(numbers, verdict, unavailable);
    }

    private Map<String, Object> afterCosts(Trial trial, String unavailable) {
        FactorDefinition def = trial.definition();
        boolean built = def != null && def.method() != FactorDefinition.Method.EXTERNAL;
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("cost_bps", def == null ? Double.NaN : def.effectiveCostBps());
        PeriodStatistics net = PeriodStatistics.of(ReturnSeries.empty());
        TradingCosts costs = new TradingCosts(Double.NaN, Double.NaN);
        if (built && unavailable == null) {
            long id = trial.version().factorId();
            int version = trial.version().version();
            net = PeriodStatistics.of(MonthlyBasis.of(factors.series(id, version, FactorStore.Leg.NET)).monthly());
            SeriesSummary stored = factors.seriesSummary(id, version);
            if (stored.observations() > 0) {
                costs = StoredCosts.of(factors, trial.version(), stored.firstDate(), stored.lastDate());
            }
        }
        numbers.put("n", net.n());
        numbers.put("average_annual_turnover", costs.averageAnnualTurnover());
        numbers.put("mean_net", net.mean());
        numbers.put("nw_t_stat_net", net.nwTStat());
        numbers.put("break_even_cost_bps", costs.breakEvenCostBps());
        return EvidenceJson.section(numbers, EvidenceVerdicts.afterCosts(built, net.n(), net.mean(), net.nwTStat()), unavailable);
    }

    private static Map<String, Object> redundancy(ReturnSeries monthly, List<Trial> against, String unavailable) {
        SpanningRegression regression = SpanningRegression.of(monthly, against.stream().map(Trial::monthly).toList());
        Map<String, Object> numbers = new LinkedHashMap<>();
        numbers.put("against", against.stream().map(Trial::name).toList());
        numbers.put("n", regression.n());
        numbers.put("alpha", regression.alpha());
        numbers.put("alpha_nw_t_stat", regression.alphaNwTStat());
        numbers.put("nw_lags", regression.nwLags());
        numbers.put("betas", regression.betas());
        numbers.put("r_squared", regression.rSquared());
        return EvidenceJson.section(numbers, EvidenceVerdicts.redundancy(against.size(), regression), unavailable);
    }
}
