package dev.winnow.research;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.research.TrialLibrary.Snapshot;
import dev.winnow.research.TrialLibrary.Trial;
import dev.winnow.stats.CalendarPeriods;
import dev.winnow.stats.Correlations;
import dev.winnow.stats.EqualWeightComposite;
import dev.winnow.stats.Frequency;
import dev.winnow.stats.FrequencyConversion;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.ThemeComparison;
import dev.winnow.stats.TrialStatistics;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/** Declared themes beside correlation clusters, and a theme's composite series. */
public final class Themes {
    private final FactorStore factors;

    public Themes(FactorStore factors) {
        this.factors = factors;
    }

    /**
     * The live factors by declared theme, and the clusters of those with at least three monthly returns by average
     * linkage on 1 - rho (Pearson, monthly, pairwise complete) cut at {@code threshold}; the others are listed with
     * the reason they could not be clustered. Inputs are in no theme and no cluster.
     */
    public Comparison comparison(Snapshot library, double threshold) {
        List<Trial> live = library.live().stream().filter(t -> !t.input()).toList();
        List<String> clusteredNames = new ArrayList<>();
        List<String> clusteredThemes = new ArrayList<>();
        List<ReturnSeries> clusteredSeries = new ArrayList<>();
        List<Unclustered> excluded = new ArrayList<>();
        for (Trial t : live) {
            if (t.usable()) {
                clusteredNames.add(t.name());
                clusteredThemes.add(t.theme());
                clusteredSeries.add(t.monthly());
            } else {
                excluded.add(new Unclustered(t.name(), t.excluded() ? t.basis().excludedReason()
                        : "fewer than " + TrialStatistics.MIN_OBSERVATIONS + " monthly returns (status " + t.version().status().wireName() + ")"));
            }
        }
        double[][] correlation = Correlations.matrix(clusteredSeries, Correlations.Method.PEARSON).matrix();
        ThemeComparison comparison = ThemeComparison.of(clusteredNames, clusteredThemes, correlation, threshold);
        return new Comparison("monthly", threshold,
                ThemeComparison.declaredGroups(live.stream().map(Trial::name).toList(), live.stream().map(Trial::theme).toList()),
                comparison.clusters(),
                comparison.disagreements().stream().map(d -> new Disagreement(List.of(d.first(), d.second()),
                        d.kind().name().toLowerCase(Locale.ROOT), d.correlation())).toList(),
                excluded);
    }

    /** The body of {@code GET /v1/themes}: declared themes beside the correlation clusters, and where they disagree. */
    public record Comparison(String basis, double threshold, List<ThemeComparison.DeclaredGroup> declared,
                             List<ThemeComparison.Cluster> clusters, List<Disagreement> disagreements, List<Unclustered> excluded) {
    }

    /** Two factors whose declared themes and correlation disagree, and how. */
    public record Disagreement(List<String> factors, String kind, double correlation) {
    }

    /** A live factor left out of the clustering, with the reason. */
    public record Unclustered(String factor, String reason) {
    }

    /** A theme's composite series and what it is made of. */
    public record Composite(String theme, List<String> factors, Frequency frequency, ReturnSeries series) {
    }

    /** The theme's live members with a series, inputs left out; {@link UnknownNameException} when there is none. */
    public List<FactorVersionRecord> members(String theme) {
        List<FactorVersionRecord> members = new ArrayList<>();
        List<FactorVersionRecord> live = factors.listCurrent(false);
        FactorRoles roles = FactorRoles.of(live);
        for (FactorVersionRecord v : live) {
            DefinitionJson.Parsed parsed = DefinitionJson.read(v.definitionJson());
            if (parsed.ok() && theme.equals(parsed.definition().theme()) && v.status() == VersionStatus.READY && !roles.input(v.name())) {
                members.add(v);
            }
        }
        if (members.isEmpty()) {
            throw new UnknownNameException("No live factor with a series declares the theme '" + theme + "'", NameKind.THEME);
        }
        return members;
    }

    /**
     * The theme's composite: the equal-weight average of its live, ready members' spread returns on the dates all of
     * them have. Members of different frequencies are first compounded to the coarsest of them; when that is weekly or
     * coarser, every member's periods are dated by their last calendar day, so that members whose periods end on
     * different days line up. Then from/to (each may be null), the target frequency (null: the members' own) and the
     * cumulative form as for a factor's returns.
     */
    public Composite composite(String theme, List<FactorVersionRecord> members, LocalDate from, LocalDate to, Frequency target,
                               boolean cumulative) {
        List<ReturnSeries> series = new ArrayList<>();
        Frequency coarsest = Frequency.DAILY;
        for (FactorVersionRecord v : members) {
            ReturnSeries s = factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD);
            series.add(s);
            Frequency f = Frequency.fromDates(List.of(s.dates()));
            coarsest = f.compareTo(coarsest) > 0 ? f : coarsest;
        }
        for (int i = 0; i < series.size(); i++) {
            ReturnSeries s = FrequencyConversion.compound(series.get(i), coarsest);
            series.set(i, coarsest == Frequency.DAILY ? s : CalendarPeriods.labelledByPeriodEnd(s, coarsest));
        }
        ReturnSeries composite = EqualWeightComposite.of(series).between(from, to);
        Frequency frequency = coarsest;
        if (target != null && target != coarsest) {
            if (target.compareTo(coarsest) < 0) {
                throw new InvalidRequestException("Theme '" + theme + "' is " + coarsest.wireName() + "; it cannot be converted to the finer frequency '"
                        + target.wireName() + "'.");
            }
            composite = FrequencyConversion.compound(composite, target);
            frequency = target;
        }
        if (cumulative) {
            composite = FrequencyConversion.cumulative(composite);
        }
        return new Composite(theme, members.stream().map(FactorVersionRecord::name).toList(), frequency, composite);
    }
}
