package dev.winnow.stats;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;

/**
 * Factors grouped two ways side by side: by the theme their definitions declare ({@link #declaredGroups}), and by
 * average-linkage clustering of their correlations ({@link HierarchicalClustering}: distance 1 - rho, merged while the average correlation is at
 * least the threshold); and the pairs the two groupings treat differently.
 *
 * @param clusters      the correlation clusters, numbered from 0 in order of their first member
 * @param disagreements pairs declared together but clustered apart, or clustered together but not declared together
 *                      (a factor without a theme is declared together with no other)
 */
public record ThemeComparison(List<Cluster> clusters, List<Disagreement> disagreements) {

    public ThemeComparison {
        clusters = List.copyOf(clusters);
        disagreements = List.copyOf(disagreements);
    }

    public record DeclaredGroup(String theme, List<String> factors) {
        public DeclaredGroup {
            factors = List.copyOf(factors);
        }
    }

    public record Cluster(int cluster, List<String> factors) {
        public Cluster {
            factors = List.copyOf(factors);
        }
    }

    public enum Kind {
        SAME_THEME_OTHER_CLUSTER,
        SAME_CLUSTER_OTHER_THEME
    }

    /** Two factors in input order, how the groupings disagree on them, and their correlation. */
    public record Disagreement(String first, String second, Kind kind, double correlation) {
    }

    /**
     * @param names       factor names, distinct
     * @param themes      declared theme per factor (null for none), in the order of names
     * @param correlation correlation matrix in the order of names, as {@link HierarchicalClustering} takes it
     * @param threshold   minimum average correlation for two clusters to merge, in [-1, 1]
     */
    public static ThemeComparison of(List<String> names, List<String> themes, double[][] correlation, double threshold) {
        checkNamesAndThemes(names, themes);
        int[] labels = HierarchicalClustering.averageLinkageClusters(correlation, threshold);
        return new ThemeComparison(clusters(names, labels),
                disagreements(names, themes, labels, correlation));
    }

    /**
     * Factors by declared theme: one group per theme (sorted by theme, members in input order), then one with theme
     * null for the factors that declare none.
     */
    public static List<DeclaredGroup> declaredGroups(List<String> names, List<String> themes) {
        checkNamesAndThemes(names, themes);
        Map<String, List<String>> byTheme = new TreeMap<>(Comparator.nullsLast(Comparator.naturalOrder()));
        for (int i = 0; i < names.size(); i++) {
            byTheme.computeIfAbsent(themes.get(i), t -> new ArrayList<>()).add(names.get(i));
        }
        List<DeclaredGroup> out = new ArrayList<>();
        byTheme.forEach((theme, members) -> out.add(new DeclaredGroup(theme, members)));
        return out;
    }

    private static List<Cluster> clusters(List<String> names, int[] labels) {
        Map<Integer, List<String>> byLabel = new LinkedHashMap<>();
        for (int i = 0; i < labels.length; i++) {
            byLabel.computeIfAbsent(labels[i], l -> new ArrayList<>()).add(names.get(i));
        }
        List<Cluster> out = new ArrayList<>();
        byLabel.forEach((label, members) -> out.add(new Cluster(label, members)));
        return out;
    }

    private static List<Disagreement> disagreements(List<String> names, List<String> themes, int[] labels,
                                                    double[][] correlation) {
        List<Disagreement> out = new ArrayList<>();
        for (int i = 0; i < names.size(); i++) {
            for (int j = i + 1; j < names.size(); j++) {
                boolean sameTheme = themes.get(i) != null && Objects.equals(themes.get(i), themes.get(j));
                boolean sameCluster = labels[i] == labels[j];
                if (sameTheme != sameCluster) {
                    Kind kind = sameTheme ? Kind.SAME_THEME_OTHER_CLUSTER : Kind.SAME_CLUSTER_OTHER_THEME;
                    out.add(new Disagreement(names.get(i), names.get(j), kind, correlation[i][j]));
                }
            }
        }
        return out;
    }

    private static void checkNamesAndThemes(List<String> names, List<String> themes) {
        AnalyticsChecks.notNull(names, "names");
        AnalyticsChecks.notNull(themes, "themes");
        if (themes.size() != names.size()) {
            throw new IllegalArgumentException("themes must give one entry (or null) per name: " + themes.size()
                    + " themes for " + names.size() + " names");
        }
        if (names.stream().distinct().count() != names.size()) {
            throw new IllegalArgumentException("factor names must be distinct: " + names);
        }
    }
}
