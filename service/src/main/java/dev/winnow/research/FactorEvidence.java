package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
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
    public Report report(Trial trial, Snapshot library, String segmentColumn, List<Trial> against) {
        String unavailable = unavailable(trial);
        ReturnSeries monthly = trial.monthly();
        PeriodStatistics full = PeriodStatistics.of(monthly);
        FactorDefinition def = trial.definition();
        String rationale = def == null ? null : def.rationale();
        return new Report(trial.name(), trial.version().version(), trial.version().retired(), "monthly", library.table().trials(),
                significance(trial, unavailable), stability(monthly, full, def, unavailable),
                unavailable != null
                        ? EvidenceJson.section(Breadth.emptyNumbers(segmentColumn), EvidenceVerdicts.notEnoughData(Section.BREADTH, unavailable), null)
                        : breadth.section(trial, segmentColumn, full.mean()),
                variants(trial, library, full, unavailable), afterCosts(trial, unavailable),
                EvidenceJson.section(new Rationale(rationale), EvidenceVerdicts.rationale(rationale), null),
                redundancy(monthly, against, unavailable), monotonicity(trial, monthly, unavailable), live(trial, monthly, unavailable));
    }

    /** The body of {@code GET /v1/factors/{f}/evidence}: the version, the basis, N, then each section. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Report(String factor, int version, boolean retired, String basis, int trials,
                         EvidenceJson.Section<EvidenceJson.Row> significance, EvidenceJson.Section<Stability> stability,
                         EvidenceJson.Section<Breadth.Numbers> breadth, EvidenceJson.Section<Variants> variants,
                         EvidenceJson.Section<AfterCosts> afterCosts, EvidenceJson.Section<Rationale> rationale,
                         EvidenceJson.Section<Redundancy> redundancy, EvidenceJson.Section<MonotonicityNumbers> monotonicity,
                         EvidenceJson.Section<Live> live) {
    }

    public record Rationale(String text) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record MonotonicityNumbers(List<Monotonicity.Bucket> buckets, List<Monotonicity.Step> steps, int stepsInDirection,
                                      double minStepT, double rankCorrelation) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Live(java.time.OffsetDateTime definedAt, LiveRecord.Side before, LiveRecord.Side after, double meanRatio) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Stability(List<PeriodStatistics> halves, List<PeriodStatistics> decades, int rollingWindow,
                            @JsonProperty("share_above_2") double shareAbove2, StabilityReport.DiscoverySplit foundOn) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Member(String factor, @JsonProperty("nw_t_stat") double nwTStat, double correlation) {
    }

    public record Variants(String theme, String family, List<Member> members, PeriodStatistics composite) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record AfterCosts(double costBps, int n, double averageAnnualTurnover, double meanNet,
                             @JsonProperty("nw_t_stat_net") double nwTStatNet, double breakEvenCostBps) {
    }

    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Redundancy(List<String> against, int n, double alpha, @JsonProperty("alpha_nw_t_stat") double alphaNwTStat,
                             int nwLags, double[] betas, double rSquared) {
    }

    /**
     * Monotonicity across the buckets of a sort factor ({@link Monotonicity}) on the monthly basis; other methods have
     * no buckets and get not_enough_data.
     */
    private EvidenceJson.Section<MonotonicityNumbers> monotonicity(Trial trial, ReturnSeries monthly, String unavailable) {
        FactorDefinition def = trial.definition();
        MonotonicityNumbers none = new MonotonicityNumbers(List.of(), List.of(), 0, Double.NaN, Double.NaN);
        if (def == null || def.method() != FactorDefinition.Method.SORT) {
            return EvidenceJson.section(none, new SectionVerdict(Verdict.NOT_ENOUGH_DATA, Monotonicity.thresholds(),
                    "Only sort factors have buckets to compare; this is a " + DefinitionJson.wire(trial.version().method()) + " factor."), unavailable);
        }
        if (unavailable != null) {
            return EvidenceJson.section(none, new SectionVerdict(Verdict.NOT_ENOUGH_DATA, Monotonicity.thresholds(), unavailable), unavailable);
        }
        Map<String, ReturnSeries> stored = factors.portfolios(trial.version().factorId(), trial.version().version());
        List<ReturnSeries> buckets = new ArrayList<>();
        for (String name : FactorEngine.portfolioNames(def)) {
            buckets.add(MonthlyBasis.of(stored.getOrDefault(name, ReturnSeries.empty())).monthly());
        }
        Monotonicity.Result r = Monotonicity.of(buckets, def.effectiveDirection() == FactorDefinition.Direction.HIGH_MINUS_LOW,
                PeriodStatistics.of(monthly).nwTStat());
        return EvidenceJson.section(new MonotonicityNumbers(r.buckets(), r.steps(), r.stepsInDirection(), r.minStepT(), r.rankCorrelation()),
                r.verdict(), null);
    }

    /** The live record: months ending after the day Winnow recorded this version's definition, against those before. */
    private static EvidenceJson.Section<Live> live(Trial trial, ReturnSeries monthly, String unavailable) {
        java.time.OffsetDateTime definedAt = trial.version().createdAt();
        LiveRecord.Result record = LiveRecord.of(monthly, definedAt.atZoneSameInstant(java.time.ZoneOffset.UTC).toLocalDate());
        return EvidenceJson.section(new Live(definedAt, record.before(), record.after(), record.meanRatio()), record.verdict(), unavailable);
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
                    .orElseThrow(() -> new InvalidRequestException("'against' names '" + name + "', which is not a live factor", NameKind.FACTOR));
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

    private static EvidenceJson.Section<EvidenceJson.Row> significance(Trial trial, String unavailable) {
        if (trial.row() == null) {
            double nan = Double.NaN;
            TrialRow undefined = new TrialRow(TrialStatistics.undefined(0), nan, nan, nan, nan, null, nan, nan);
            return EvidenceJson.section(EvidenceJson.row(trial, undefined), EvidenceVerdicts.notEnoughData(Section.SIGNIFICANCE, unavailable), null);
        }
        return EvidenceJson.section(EvidenceJson.row(trial, trial.row()), EvidenceVerdicts.significance(trial.row()), unavailable);
    }

    private static EvidenceJson.Section<Stability> stability(ReturnSeries monthly, PeriodStatistics full, FactorDefinition def, String unavailable) {
        StabilityReport report = StabilityReport.of(monthly, EvidenceVerdicts.ROLLING_WINDOW, EvidenceVerdicts.ROLLING_T,
                def == null ? null : def.foundOn());
        return EvidenceJson.section(new Stability(report.halves(), report.decades(), report.rollingWindow(), report.shareAbove(), report.foundOn()),
                EvidenceVerdicts.stability(full.n(), full.mean(), report), unavailable);
    }

    private static EvidenceJson.Section<Variants> variants(Trial trial, Snapshot library, PeriodStatistics full, String unavailable) {
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
        List<Member> rows = new ArrayList<>();
        double[] tStats = new double[members.size()];
        List<ReturnSeries> series = new ArrayList<>();
        for (int i = 0; i < members.size(); i++) {
            Trial m = members.get(i);
            tStats[i] = PeriodStatistics.of(m.monthly()).nwTStat();
            series.add(m.monthly());
            rows.add(new Member(m.name(), tStats[i], Correlations.correlation(trial.monthly(), m.monthly(), Correlations.Method.PEARSON)));
        }
        PeriodStatistics composite = members.size() < 2 ? null : PeriodStatistics.of(EqualWeightComposite.of(series));
        Variants numbers = new Variants(theme, family, theme == null && family == null ? List.of() : rows, composite);
        // a factor without a theme still has variants when it belongs to a family
        SectionVerdict verdict = EvidenceVerdicts.variants(theme != null ? theme : family, full.mean(), tStats, composite);
        return EvidenceJson.section(numbers, verdict, unavailable);
    }

    private EvidenceJson.Section<AfterCosts> afterCosts(Trial trial, String unavailable) {
        FactorDefinition def = trial.definition();
        boolean built = def != null && def.method() != FactorDefinition.Method.EXTERNAL;
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
        AfterCosts numbers = new AfterCosts(def == null ? Double.NaN : def.effectiveCostBps(), net.n(), costs.averageAnnualTurnover(),
                net.mean(), net.nwTStat(), costs.breakEvenCostBps());
        return EvidenceJson.section(numbers, EvidenceVerdicts.afterCosts(built, net.n(), net.mean(), net.nwTStat()), unavailable);
    }

    private static EvidenceJson.Section<Redundancy> redundancy(ReturnSeries monthly, List<Trial> against, String unavailable) {
        SpanningRegression regression = SpanningRegression.of(monthly, against.stream().map(Trial::monthly).toList());
        Redundancy numbers = new Redundancy(against.stream().map(Trial::name).toList(), regression.n(), regression.alpha(),
                regression.alphaNwTStat(), regression.nwLags(), regression.betas(), regression.rSquared());
        return EvidenceJson.section(numbers, EvidenceVerdicts.redundancy(against.size(), regression), unavailable);
    }
}
