package dev.winnow.construct;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.Objects;

/**
 * Security loadings at one as-of date, column by column. Row i belongs to security {@code securityIds[i]}
 * (strictly increasing panel-local ids: the securities with a row at the date). {@code usable[i]} counts the window
 * dates where the security's return and every factor's return exist; below {@code minObs} the row's statistics are NaN.
 * {@code betas[j][i]} is the slope of row i on factor j. {@code factorDigest} identifies the factor returns and grid
 * dates the window used (see {@link FactorGrid#digest}).
 *
 * <p>Arrays are shared, not copied, for speed: producers hand over fresh arrays and nobody mutates them.
 * Equality compares every number bit for bit (NaN equals NaN).
 */
public record LoadingsTable(LocalDate date, int minObs, int[] securityIds, int[] usable, double[] alpha,
                            double[][] betas, double[] rSquared, double[] residualVol, long factorDigest) {

    public LoadingsTable {
        Objects.requireNonNull(date, "date");
        int m = securityIds.length;
        if (usable.length != m || alpha.length != m || rSquared.length != m || residualVol.length != m) {
            throw new IllegalArgumentException("loadings columns differ from the number of securities at " + date);
        }
        for (double[] column : betas) {
            if (column.length != m) {
                throw new IllegalArgumentException("a beta column differs from the number of securities at " + date);
            }
        }
    }

    public int size() {
        return securityIds.length;
    }

    public int factorCount() {
        return betas.length;
    }

    /** Row index of a security, or a negative number when it has no row at this date. */
    public int rowOf(int securityId) {
        return Arrays.binarySearch(securityIds, securityId);
    }

    /** The betas of one row, in factor order. */
    public double[] betasOf(int row) {
        double[] b = new double[betas.length];
        for (int j = 0; j < b.length; j++) {
            b[j] = betas[j][row];
        }
        return b;
    }

    /** True when the row's regression ran and identified its coefficients. */
    public boolean hasLoadings(int row) {
        return !Double.isNaN(alpha[row]);
    }

    /** Why a row has no loadings, or null when it has them. */
    public String reason(int row) {
        if (usable[row] < minObs) {
            return usable[row] + " usable dates, fewer than min_obs " + minObs;
        }
        if (!hasLoadings(row)) {
            return "the factor returns are collinear over the " + usable[row] + " usable dates, so the loadings are not identified";
        }
        return null;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof LoadingsTable t && date.equals(t.date) && minObs == t.minObs && factorDigest == t.factorDigest
                && Arrays.equals(securityIds, t.securityIds) && Arrays.equals(usable, t.usable)
                && Arrays.equals(alpha, t.alpha) && Arrays.deepEquals(betas, t.betas)
                && Arrays.equals(rSquared, t.rSquared) && Arrays.equals(residualVol, t.residualVol);
    }

    @Override
    public int hashCode() {
        return Objects.hash(date, minObs, factorDigest, Arrays.hashCode(securityIds), Arrays.hashCode(alpha));
    }

    @Override
    public String toString() {
        return "LoadingsTable[" + date + ", securities=" + size() + ", factors=" + factorCount() + ", minObs=" + minObs + "]";
    }
}
