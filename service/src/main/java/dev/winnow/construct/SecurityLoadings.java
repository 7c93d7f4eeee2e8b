package dev.winnow.construct;

import dev.winnow.stats.LinearRegression;
import dev.winnow.stats.RegressionResult;
import dev.winnow.stats.ReturnSeries;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;
import java.util.function.Consumer;
import java.util.stream.IntStream;

/**
 * Security loadings by time-series regression (the regressions of Fama and French 1993, Journal of Financial
 * Economics 33, of each security's returns on factor returns): for as-of grid date D, every security with a row at D is
 * fitted by OLS with intercept
 * <pre>
 * r_it = alpha_i + sum_j beta_ij f_jt + u_it,   t in the last W grid dates up to and including D,
 * </pre>
 * over the usable dates, where r_it and every f_jt exist (factor returns join the grid on exact dates). With n usable
 * dates and k factors: R^2 = 1 - SSR / SST (SST centred on the mean of r_i over the usable dates) and
 * residual vol = sqrt(SSR / (n - k - 1)), per period (Greene, Econometric Analysis, ch. 3-4). A security with fewer
 * than min_obs usable dates gets n and NaN statistics. Early in the panel the window holds the dates there are.
 *
 * <p>For one date the W cross-sections are read once into a dense returns matrix [security x date]; every security
 * is fitted with one shared QR factorisation of the factor design ({@link LinearRegression#design}) when it has
 * no missing date, and by a fit of its own otherwise. Sliding over a range keeps the last W dates' returns in a ring
 * buffer, so each cross-section is read once. Every path runs the same fit on the same numbers, so results agree
 * bit for bit.
 */
public final class SecurityLoadings {

    private SecurityLoadings() {
    }

    /** Loadings at grid index {@code dateIndex}; aligns the factor series to the panel's grid first. */
    public static LoadingsTable at(PanelSource panel, List<ReturnSeries> factors, int dateIndex, int window, int minObs) {
        return at(panel, FactorGrid.align(factors, panel.dates()), dateIndex, window, minObs);
    }

    /** Loadings at grid index {@code dateIndex}, reading the window's cross-sections once. */
    public static LoadingsTable at(PanelSource panel, FactorGrid factors, int dateIndex, int window, int minObs) {
        checkArguments(panel, factors, dateIndex, dateIndex, window, minObs);
        ReturnWindow returns = new ReturnWindow(window);
        for (int t = FactorGrid.windowStart(dateIndex, window); t <= dateIndex; t++) {
            returns.push(panel.crossSection(t));
        }
        return regress(returns, factors, dateIndex, window, minObs);
    }

    /**
     * Loadings at every grid index from {@code fromIndex} to {@code toIndex}, handed to {@code sink} in date order.
     * Each cross-section is read once: the window slides over a ring buffer of the last W dates' returns.
     */
    public static void slide(PanelSource panel, FactorGrid factors, int fromIndex, int toIndex, int window, int minObs,
                             Consumer<LoadingsTable> sink) {
        checkArguments(panel, factors, fromIndex, toIndex, window, minObs);
        ReturnWindow returns = new ReturnWindow(window);
        for (int t = FactorGrid.windowStart(fromIndex, window); t <= toIndex; t++) {
            returns.push(panel.crossSection(t));
            if (t >= fromIndex) {
                sink.accept(regress(returns, factors, t, window, minObs));
            }
        }
    }

    /**
     * One security's loadings at each grid index from {@code fromIndex} to {@code toIndex} where it has a row,
     * computed exactly as {@link #at} computes them (the same fit on the same numbers).
     */
    public static SecurityLoadingsHistory history(PanelSource panel, FactorGrid factors, int securityId, int fromIndex,
                                                  int toIndex, int window, int minObs) {
        checkArguments(panel, factors, fromIndex, toIndex, window, minObs);
        int start = FactorGrid.windowStart(fromIndex, window);
        double[] returns = new double[toIndex - start + 1];
        boolean[] hasRow = new boolean[returns.length];
        int rowDates = 0;
        for (int t = start; t <= toIndex; t++) {
            CrossSection cs = panel.crossSection(t);
            int row = cs.rowOf(securityId);
            hasRow[t - start] = row >= 0;
            returns[t - start] = row >= 0 ? finiteOrNaN(cs.returns()[row]) : Double.NaN;
            if (row >= 0 && t >= fromIndex) {
                rowDates++;
            }
        }
        int k = factors.factorCount();
        SecurityLoadingsHistory.Builder out = new SecurityLoadingsHistory.Builder(rowDates, k);
        for (int d = fromIndex; d <= toIndex; d++) {
            if (!hasRow[d - start]) {
                continue;
            }
            int from = FactorGrid.windowStart(d, window);
            double[][] x = factors.columns(from, d);
            double[] y = Arrays.copyOfRange(returns, from - start, d - start + 1);
            int usable = countUsable(y, factorsPresent(x));
            RegressionResult fit = usable >= minObs ? LinearRegression.design(x).fit(y) : null;
            out.add(panel.dates().get(d), usable, fit);
        }
        return out.build();
    }

    private static LoadingsTable regress(ReturnWindow window, FactorGrid factors, int dateIndex, int windowSize, int minObs) {
        int from = FactorGrid.windowStart(dateIndex, windowSize);
        double[][] x = factors.columns(from, dateIndex);
        boolean[] present = factorsPresent(x);
        int[] ids = window.newestIds();
        double[][] y = window.returnsOf(ids);
        int m = ids.length;
        int k = x.length;
        int[] usable = new int[m];
        double[] alpha = nans(m);
        double[][] betas = new double[k][];
        for (int j = 0; j < k; j++) {
            betas[j] = nans(m);
        }
        double[] rSquared = nans(m);
        double[] residualVol = nans(m);
        LinearRegression.Design design = LinearRegression.design(x);
        // Securities are independent and each writes only its own slots, so they may be fitted in parallel.
        IntStream.range(0, m).parallel().forEach(i -> {
            usable[i] = countUsable(y[i], present);
            if (usable[i] < minObs) {
                return;
            }
            RegressionResult fit = design.fit(y[i]);
            alpha[i] = fit.alpha();
            for (int j = 0; j < k; j++) {
                betas[j][i] = fit.beta(j);
            }
            rSquared[i] = fit.rSquared();
            residualVol[i] = fit.residualStdev();
        });
        return new LoadingsTable(factors.dates().get(dateIndex), minObs, ids, usable, alpha, betas, rSquared, residualVol,
                factors.digest(dateIndex, windowSize));
    }

    private static boolean[] factorsPresent(double[][] x) {
        boolean[] present = new boolean[x[0].length];
        for (int t = 0; t < present.length; t++) {
            boolean all = true;
            for (double[] column : x) {
                all &= !Double.isNaN(column[t]);
            }
            present[t] = all;
        }
        return present;
    }

    private static int countUsable(double[] y, boolean[] factorsPresent) {
        int n = 0;
        for (int t = 0; t < y.length; t++) {
            if (factorsPresent[t] && !Double.isNaN(y[t])) {
                n++;
            }
        }
        return n;
    }

    private static double finiteOrNaN(double v) {
        return Double.isFinite(v) ? v : Double.NaN;
    }

    private static double[] nans(int n) {
        double[] a = new double[n];
        Arrays.fill(a, Double.NaN);
        return a;
    }

    private static void checkArguments(PanelSource panel, FactorGrid factors, int fromIndex, int toIndex, int window, int minObs) {
        if (panel == null || factors == null) {
            throw new IllegalArgumentException("a panel and its aligned factor returns are required");
        }
        if (!factors.dates().equals(panel.dates())) {
            throw new IllegalArgumentException("the factor returns were aligned to another grid; align them to this panel's dates");
        }
        int dates = panel.dates().size();
        if (fromIndex < 0 || toIndex >= dates || fromIndex > toIndex) {
            throw new IllegalArgumentException("date indices " + fromIndex + ".." + toIndex + " must lie within 0.." + (dates - 1)
                    + " and be in order");
        }
        int floor = factors.factorCount() + 2;
        if (window < floor || minObs < floor || minObs > window) {
            throw new IllegalArgumentException("need factors + 2 = " + floor + " <= min_obs <= window, got min_obs " + minObs
                    + " and window " + window);
        }
    }

    /** The returns of the last W dates pushed, oldest first; each date keeps only its ids and returns. */
    private static final class ReturnWindow {
        private final int[][] ids;
        private final double[][] returns;
        private int pushed;

        ReturnWindow(int capacity) {
            this.ids = new int[capacity][];
            this.returns = new double[capacity][];
        }

        void push(CrossSection cs) {
            int slot = pushed % ids.length;
            ids[slot] = cs.securityIds();
            returns[slot] = cs.returns();
            pushed++;
        }

        int size() {
            return Math.min(pushed, ids.length);
        }

        int[] newestIds() {
            return ids[(pushed - 1) % ids.length];
        }

        /** Dense [security x date] returns of the given securities (sorted ids), NaN where a date has no value. */
        double[][] returnsOf(int[] securities) {
            int length = size();
            double[][] y = new double[securities.length][length];
            for (double[] row : y) {
                Arrays.fill(row, Double.NaN);
            }
            for (int t = 0; t < length; t++) {
                int slot = (pushed - length + t) % ids.length;
                int[] dateIds = ids[slot];
                double[] dateReturns = returns[slot];
                int a = 0;
                int b = 0;
                while (a < dateIds.length && b < securities.length) {
                    if (dateIds[a] == securities[b]) {
                        y[b][t] = finiteOrNaN(dateReturns[a]);
                        a++;
                        b++;
                    } else if (dateIds[a] < securities[b]) {
                        a++;
                    } else {
                        b++;
                    }
                }
            }
            return y;
        }
    }
}
