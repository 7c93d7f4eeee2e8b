package dev.winnow.research;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.stats.MonthlyBasis;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.TrialRow;
import dev.winnow.stats.TrialStatistics;
import dev.winnow.stats.TrialTable;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * Every factor version ever built (retired ones included) on the monthly basis, and the library-wide trial table over
 * them. Versions whose status is not ready get an empty series. Quarterly and annual series are no trial (they cannot
 * be put on the monthly basis) and stay out of the table with the reason.
 *
 * <p>Every version of every candidate factor is a trial, as the rule says: every version ever built. Inputs
 * ({@link FactorRoles}: declared {@code "role": "input"}, or undeclared and named as a live definition's
 * {@code risk_free}) are no trials: they are what premia are measured against or regressed on, not candidate premia,
 * and a near-constant risk-free rate's huge Sharpe ratio would dominate the variance V of the deflated Sharpe ratio.
 * They stay out of the table with the reason. Neither an input nor a risk-free rate is a default regressor of the
 * spanning regression. The snapshot is reused until any version's status, data version or retirement changes.
 */
public final class TrialLibrary {
    private final FactorStore factors;
    private volatile Snapshot cached;

    public TrialLibrary(FactorStore factors) {
        this.factors = factors;
    }

    /**
     * One factor version as a trial.
     *
     * @param row          its row of the table; null when it is no trial (see {@link #exclusionReason()})
     * @param note         why its statistics are null (not ready, too short, no variation), or null
     * @param riskFreeOf   a live factor whose definition subtracts this one as its risk-free rate, or null
     * @param inputReason  why the factor is an input (see {@link FactorRoles}), or null for a candidate factor
     */
    public record Trial(FactorVersionRecord version, FactorDefinition definition, MonthlyBasis basis, TrialRow row, String note,
                 String riskFreeOf, String inputReason) {
        public String name() {
            return version.name();
        }

        public String theme() {
            return definition == null ? null : definition.theme();
        }

        public boolean live() {
            return version.current() && !version.retired();
        }

        /** Not on the monthly basis: quarterly or annual. */
        public boolean excluded() {
            return basis.excluded();
        }

        /** An input: served and usable, but no trial, in no theme and no default regressor. */
        public boolean input() {
            return inputReason != null;
        }

        /** True when the version is a trial with a row in the table. */
        public boolean inTable() {
            return !excluded() && !input();
        }

        /** Why the version is no trial, or null when it is one. */
        public String exclusionReason() {
            return excluded() ? basis.excludedReason() : inputReason;
        }

        public ReturnSeries monthly() {
            return basis.monthly();
        }

        /** On the monthly basis with enough months for statistics: usable in correlations and composites. */
        public boolean usable() {
            return !excluded() && monthly().size() >= TrialStatistics.MIN_OBSERVATIONS;
        }

        /** Usable, a candidate factor and not a risk-free rate: a default regressor of the spanning regression. */
        public boolean premium() {
            return usable() && !input() && riskFreeOf == null;
        }

        /** Usable and a candidate factor: a member of themes, clusters and a factor's variants. */
        public boolean candidate() {
            return usable() && !input();
        }
    }

    /** All trials in store order (factor name, then version) with the table's N, V and SR0. */
    public record Snapshot(String key, List<Trial> trials, TrialTable table) {
        public Optional<Trial> find(FactorVersionRecord v) {
            return trials.stream().filter(t -> t.version().factorId() == v.factorId() && t.version().version() == v.version()).findFirst();
        }

        public List<Trial> live() {
            return trials.stream().filter(Trial::live).toList();
        }
    }

    /** Every version of every candidate factor as a trial; inputs listed as excluded with the reason. */
    public Snapshot snapshot() {
        List<FactorVersionRecord> versions = factors.allVersions();
        String key = keyOf(versions);
        Snapshot current = cached;
        if (current != null && current.key().equals(key)) {
            return current;
        }
        Snapshot fresh = build(key, versions);
        cached = fresh;
        return fresh;
    }

    private Snapshot build(String key, List<FactorVersionRecord> versions) {
        List<FactorDefinition> definitions = versions.stream().map(TrialLibrary::definitionOf).toList();
        FactorRoles roles = FactorRoles.of(versions);
        List<Trial> unranked = new ArrayList<>();
        List<TrialStatistics> statistics = new ArrayList<>();
        for (int i = 0; i < versions.size(); i++) {
            FactorVersionRecord v = versions.get(i);
            boolean ready = v.status() == VersionStatus.READY;
            ReturnSeries series = ready ? factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD) : ReturnSeries.empty();
            Trial trial = new Trial(v, definitions.get(i), MonthlyBasis.of(series), null, null, roles.riskFreeOf(v.name()),
                    roles.inputReason(v.name()));
            unranked.add(trial);
            if (trial.inTable()) {
                statistics.add(ready ? TrialStatistics.of(trial.monthly().values()) : TrialStatistics.undefined(0));
            }
        }
        TrialTable table = TrialTable.of(statistics);
        List<Trial> trials = new ArrayList<>();
        int row = 0;
        for (Trial t : unranked) {
            TrialRow r = t.inTable() ? table.rows().get(row++) : null;
            trials.add(new Trial(t.version(), t.definition(), t.basis(), r, r == null ? null : noteOf(t.version(), r.statistics()),
                    t.riskFreeOf(), t.inputReason()));
        }
        return new Snapshot(key, List.copyOf(trials), table);
    }

    private static String noteOf(FactorVersionRecord v, TrialStatistics s) {
        if (v.status() != VersionStatus.READY) {
            return "status " + v.status().wireName() + ": no series to test";
        }
        if (s.n() < TrialStatistics.MIN_OBSERVATIONS) {
            return "fewer than " + TrialStatistics.MIN_OBSERVATIONS + " monthly returns";
        }
        return s.defined() ? null : "the monthly returns do not vary, so the t-statistic is undefined";
    }

    private static FactorDefinition definitionOf(FactorVersionRecord v) {
        DefinitionJson.Parsed parsed = DefinitionJson.read(v.definitionJson());
        return parsed.ok() ? parsed.definition() : null;
    }

    private static String keyOf(List<FactorVersionRecord> versions) {
        StringBuilder key = new StringBuilder();
        for (FactorVersionRecord v : versions) {
            key.append(v.factorId()).append('.').append(v.version()).append('.').append(v.currentVersion()).append('.')
                    .append(v.status().wireName()).append('.').append(v.dataVersion()).append('.').append(v.retired()).append(';');
        }
        return key.toString();
    }
}
