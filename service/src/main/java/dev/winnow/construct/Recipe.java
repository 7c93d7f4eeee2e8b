package dev.winnow.construct;

import dev.winnow.stats.CrossSectionTransforms;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;

/**
 * A signal: a panel column or a recipe of operations on columns, evaluated per security along the period grid (grid
 * index k = position in the panel's sorted distinct dates). A security's value at a grid date where it has no row, or
 * an empty cell, is missing (NaN); any missing input makes the output missing, never zero; a non-finite result is
 * missing too. Values at grid index k are aligned with the rows of the cross-section at k.
 *
 * <p>Along the grid, per security: {@link Lag}, {@link Change}, {@link Growth}, {@link TrailingReturn},
 * {@link TrailingMean}, {@link TrailingStdev}, {@link TrailingBeta}. Element-wise: {@link Ratio}, {@link Log},
 * {@link Combine}. Across the securities with a row and a finite input at each date (optionally inside each group of
 * a label column): {@link Rank}, {@link ZScore}, {@link Winsorize}, {@link Demean}.
 *
 * <p>Each value at k is a pure function of the cross-sections at k - {@link #lookback()} .. k (and of the named
 * factors' returns), computed in a fixed order; so evaluating again from a re-read window gives the same bits, which
 * is what lets a resumed build equal a full rebuild. Records compare by value, so equal sub-recipes share cached
 * evaluations.
 */
public sealed interface Recipe {

    /** Grid dates before k that the value at k reads. */
    int lookback();

    /** Direct inputs, in order. */
    List<Recipe> inputs();

    /** The value at grid index k for every row of the cross-section at k. */
    double[] evaluate(Context ctx, int k);

    static Recipe column(String name) {
        return new Column(name);
    }

    /** Names of the factors the recipe reads (trailing_beta's {@code against}), in first-use order. */
    default Set<String> factors() {
        Set<String> names = new LinkedHashSet<>();
        collect(this, names, new LinkedHashSet<>(), new LinkedHashSet<>());
        return names;
    }

    /** Numeric columns the recipe reads. */
    default Set<String> numberColumns() {
        Set<String> names = new LinkedHashSet<>();
        collect(this, new LinkedHashSet<>(), names, new LinkedHashSet<>());
        return names;
    }

    /** Label columns the recipe reads ({@code within}). */
    default Set<String> labelColumns() {
        Set<String> names = new LinkedHashSet<>();
        collect(this, new LinkedHashSet<>(), new LinkedHashSet<>(), names);
        return names;
    }

    /** The column name when the recipe is a plain column, else null. */
    default String columnName() {
        return this instanceof Column c ? c.name() : null;
    }

    private static void collect(Recipe r, Set<String> factors, Set<String> numbers, Set<String> labels) {
        if (r instanceof Column c) {
            numbers.add(c.name());
        } else if (r instanceof TrailingReturn) {
            numbers.add("return");
        } else if (r instanceof TrailingBeta b) {
            numbers.add("return");
            factors.add(b.against());
        } else if (r instanceof CrossSectional x && x.within() != null) {
            labels.add(x.within());
        }
        for (Recipe input : r.inputs()) {
            collect(input, factors, numbers, labels);
        }
    }

    /** What evaluation needs: the rows at a grid index, cached values of sub-recipes, factor returns by index. */
    interface Context {
        /** The cross-section at grid index j (0 <= j <= k of the current evaluation). */
        CrossSection rows(int j);

        /** The (cached) value of a sub-recipe at j; j < 0 gives null. */
        double[] valueOf(Recipe recipe, int j);

        /** The named factor's return at grid date j, NaN when it has none on that exact date. */
        double factorReturn(String factor, int j);
    }

    // ------------------------------------------------------------------------------------------------ leaves
    /** A numeric column at k ({@code return} and {@code market_cap} included). */
    record Column(String name) implements Recipe {
        public int lookback() {
            return 0;
        }

        public List<Recipe> inputs() {
            return List.of();
        }

        public double[] evaluate(Context ctx, int k) {
            return ctx.rows(k).numberColumn(name);
        }
    }

    // ------------------------------------------------------------------------------------------ along the grid
    /** A at k - p; missing when k - p < 0. */
    record Lag(Recipe of, int periods) implements Recipe {
        public int lookback() {
            return of.lookback() + periods;
        }

        public List<Recipe> inputs() {
            return List.of(of);
        }

        public double[] evaluate(Context ctx, int k) {
            return Along.past(ctx, of, k, periods);
        }
    }

    /** A(k) - A(k - p). */
    record Change(Recipe of, int periods) implements Recipe {
        public int lookback() {
            return of.lookback() + periods;
        }

        public List<Recipe> inputs() {
            return List.of(of);
        }

        public double[] evaluate(Context ctx, int k) {
            double[] now = ctx.valueOf(of, k);
            double[] then = Along.past(ctx, of, k, periods);
            double[] out = new double[now.length];
            for (int i = 0; i < out.length; i++) {
                out[i] = Along.finite(now[i] - then[i]);
            }
            return out;
        }
    }

    /** A(k) / A(k - p) - 1; missing when A(k - p) <= 0. */
    record Growth(Recipe of, int periods) implements Recipe {
        public int lookback() {
            return of.lookback() + periods;
        }

        public List<Recipe> inputs() {
            return List.of(of);
        }

        public double[] evaluate(Context ctx, int k) {
            double[] now = ctx.valueOf(of, k);
            double[] then = Along.past(ctx, of, k, periods);
            double[] out = new double[now.length];
            for (int i = 0; i < out.length; i++) {
                out[i] = then[i] > 0 ? Along.finite(now[i] / then[i] - 1.0) : Double.NaN;
            }
            return out;
        }
    }

    /**
     * The compounded return prod_{j = k-s-p+1}^{k-s} (1 + return(j)) - 1, multiplied in increasing j; missing when
     * any of those p returns is missing or j < 0.
     */
    record TrailingReturn(int periods, int skip) implements Recipe {
        public int lookback() {
            return periods + skip - 1;
        }

        public List<Recipe> inputs() {
            return List.of();
        }

        public double[] evaluate(Context ctx, int k) {
            int n = ctx.rows(k).size();
            double[] product = new double[n];
            int first = k - skip - periods + 1;
            if (first < 0) {
                java.util.Arrays.fill(product, Double.NaN);
                return product;
            }
            java.util.Arrays.fill(product, 1.0);
            int[] ids = ctx.rows(k).securityIds();
            for (int j = first; j <= k - skip; j++) {
                CrossSection past = ctx.rows(j);
                double[] r = Along.align(past.securityIds(), past.returns(), ids);
                for (int i = 0; i < n; i++) {
                    product[i] *= 1.0 + r[i];
                }
            }
            for (int i = 0; i < n; i++) {
                product[i] = Along.finite(product[i] - 1.0);
            }
            return product;
        }
    }

    /**
     * A statistic of A over the window of grid dates j = k-p+1 .. k, one value per security of date k; missing unless
     * all p values exist. A record implementing it names A ({@code of}), p ({@code periods}) and the statistic.
     */
    sealed interface WindowStatistic extends Recipe {
        Recipe of();

        int periods();

        /** The statistic of security i over the window (its columns in increasing j, each aligned to date k's ids). */
        double over(double[][] window, int i);

        default int lookback() {
            return of().lookback() + periods() - 1;
        }

        default List<Recipe> inputs() {
            return List.of(of());
        }

        default double[] evaluate(Context ctx, int k) {
            double[][] window = Along.window(ctx, of(), k, periods());
            double[] out = new double[ctx.rows(k).size()];
            for (int i = 0; i < out.length; i++) {
                out[i] = window == null ? Double.NaN : over(window, i);
            }
            return out;
        }
    }

    /** The mean of A over j = k-p+1 .. k (summed in increasing j, divided by p); missing unless all p values exist. */
    record TrailingMean(Recipe of, int periods) implements WindowStatistic {
        public double over(double[][] window, int i) {
            return Along.mean(window, i);
        }
    }

    /**
     * The sample standard deviation sqrt(sum (A_j - mean)^2 / (p - 1)) over j = k-p+1 .. k, two-pass; missing unless
     * all p values exist.
     */
    record TrailingStdev(Recipe of, int periods) implements WindowStatistic {
        public double over(double[][] window, int i) {
            double mean = Along.mean(window, i);
            double squares = 0.0;
            for (double[] column : window) {
                double d = column[i] - mean;
                squares += d * d;
            }
            return Along.finite(Math.sqrt(squares / (periods - 1)));
        }
    }

    /**
     * The ordinary least squares slope, with intercept, of the security's return on the factor's return over the grid
     * dates j = k-p+1 .. k (j >= 0) where both exist: b = sum (f - f_mean)(r - r_mean) / sum (f - f_mean)^2, means
     * over those dates; missing with fewer than {@code minPeriods} such dates or zero factor variance there.
     */
    record TrailingBeta(String against, int periods, int minPeriods) implements Recipe {
        public int lookback() {
            return periods - 1;
        }

        public List<Recipe> inputs() {
            return List.of();
        }

        public double[] evaluate(Context ctx, int k) {
            int[] ids = ctx.rows(k).securityIds();
            int n = ids.length;
            int first = Math.max(0, k - periods + 1);
            int span = k - first + 1;
            double[] f = new double[span];
            double[][] r = new double[span][];
            for (int j = first; j <= k; j++) {
                f[j - first] = ctx.factorReturn(against, j);
                CrossSection past = ctx.rows(j);
                r[j - first] = Along.align(past.securityIds(), past.returns(), ids);
            }
            double[] out = new double[n];
            for (int i = 0; i < n; i++) {
                int count = 0;
                double fSum = 0.0;
                double rSum = 0.0;
                for (int t = 0; t < span; t++) {
                    if (Double.isFinite(f[t]) && Double.isFinite(r[t][i])) {
                        count++;
                        fSum += f[t];
                        rSum += r[t][i];
                    }
                }
                if (count < minPeriods) {
                    out[i] = Double.NaN;
                    continue;
                }
                double fMean = fSum / count;
                double rMean = rSum / count;
                double sxx = 0.0;
                double sxy = 0.0;
                for (int t = 0; t < span; t++) {
                    if (Double.isFinite(f[t]) && Double.isFinite(r[t][i])) {
                        double df = f[t] - fMean;
                        sxx += df * df;
                        sxy += df * (r[t][i] - rMean);
                    }
                }
                out[i] = sxx > 0 ? Along.finite(sxy / sxx) : Double.NaN;
            }
            return out;
        }
    }

    // --------------------------------------------------------------------------------------------- element-wise
    /** A / B; missing when B = 0. */
    record Ratio(Recipe numerator, Recipe denominator) implements Recipe {
        public int lookback() {
            return Math.max(numerator.lookback(), denominator.lookback());
        }

        public List<Recipe> inputs() {
            return List.of(numerator, denominator);
        }

        public double[] evaluate(Context ctx, int k) {
            double[] a = ctx.valueOf(numerator, k);
            double[] b = ctx.valueOf(denominator, k);
            double[] out = new double[a.length];
            for (int i = 0; i < out.length; i++) {
                out[i] = b[i] == 0.0 ? Double.NaN : Along.finite(a[i] / b[i]);
            }
            return out;
        }
    }

    /** The natural logarithm; missing when A <= 0. */
    record Log(Recipe of) implements Recipe {
        public int lookback() {
            return of.lookback();
        }

        public List<Recipe> inputs() {
            return List.of(of);
        }

        public double[] evaluate(Context ctx, int k) {
            double[] a = ctx.valueOf(of, k);
            double[] out = new double[a.length];
            for (int i = 0; i < out.length; i++) {
                out[i] = a[i] > 0 ? Along.finite(Math.log(a[i])) : Double.NaN;
            }
            return out;
        }
    }

    /** One term of {@link Combine}. */
    record Term(double weight, Recipe of) {
    }

    /** The weighted sum w_1 A_1 + ... + w_m A_m, added in term order; missing when any term is missing. */
    record Combine(List<Term> terms) implements Recipe {
        public Combine {
            terms = List.copyOf(terms);
        }

        public int lookback() {
            return terms.stream().mapToInt(t -> t.of().lookback()).max().orElse(0);
        }

        public List<Recipe> inputs() {
            List<Recipe> list = new ArrayList<>();
            terms.forEach(t -> list.add(t.of()));
            return list;
        }

        public double[] evaluate(Context ctx, int k) {
            double[] out = new double[ctx.rows(k).size()];
            for (Term term : terms) {
                double[] a = ctx.valueOf(term.of(), k);
                for (int i = 0; i < out.length; i++) {
                    out[i] += term.weight() * a[i];
                }
            }
            for (int i = 0; i < out.length; i++) {
                out[i] = Along.finite(out[i]);
            }
            return out;
        }
    }

    // ---------------------------------------------------------------------------------------- across securities
    /** An operation on each date's cross-section of finite values, optionally inside each label group. */
    sealed interface CrossSectional extends Recipe {
        Recipe of();

        /** The label column whose groups the operation works inside, or null for the whole cross-section. */
        String within();

        @Override
        default int lookback() {
            return of().lookback();
        }

        @Override
        default List<Recipe> inputs() {
            return List.of(of());
        }

        @Override
        default double[] evaluate(Context ctx, int k) {
            double[] a = ctx.valueOf(of(), k);
            String[] groups = within() == null ? null : ctx.rows(k).labelColumn(within());
            return CrossSectionTransforms.byGroup(a, groups, this::apply);
        }

        /** The transform of one group's finite values. */
        double[] apply(double[] values);
    }

    /** (average rank - 1) / (n - 1), ties sharing their mean rank; 0.5 when n = 1. */
    record Rank(Recipe of, String within) implements CrossSectional {
        public double[] apply(double[] values) {
            return CrossSectionTransforms.rankScaled(values);
        }
    }

    /** (A - mean) / sample standard deviation; missing when n < 2 or the deviation is 0. */
    record ZScore(Recipe of, String within) implements CrossSectional {
        public double[] apply(double[] values) {
            return CrossSectionTransforms.zScore(values);
        }
    }

    /** A clipped to its type-7 quantiles at {@code lower} and {@code upper}. */
    record Winsorize(Recipe of, double lower, double upper, String within) implements CrossSectional {
        public double[] apply(double[] values) {
            return CrossSectionTransforms.winsorize(values, lower, upper);
        }
    }

    /** A minus the mean of A over the securities with the same label; an empty label is missing. */
    record Demean(Recipe of, String within) implements CrossSectional {
        public double[] apply(double[] values) {
            return CrossSectionTransforms.demean(values);
        }
    }
}
