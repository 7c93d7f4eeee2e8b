package dev.winnow.construct;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * A portfolio's factor exposures from its holdings' loadings, as in a linear factor risk model (Grinold and Kahn,
 * Active Portfolio Management, 2nd ed., ch. 3: the portfolio exposure is the holdings-weighted sum of the securities'
 * exposures). Over the covered holdings C, those whose security has loadings at the date:
 * <pre>
 * exposure_j = sum_{i in C} w_i beta_ij
 * coverage   = sum_{i in C} |w_i| / sum_i |w_i|
 * </pre>
 * Exposures are NaN when no holding is covered; coverage is NaN when the gross weight is zero.
 *
 * @param exposures       one per factor, in factor order
 * @param coverage        share of gross weight with loadings
 * @param missingHoldings indices (into the holdings) of those without loadings, ascending
 */
public record PortfolioExposure(double[] exposures, double coverage, List<Integer> missingHoldings) {

    public PortfolioExposure {
        exposures = exposures.clone();
        missingHoldings = List.copyOf(missingHoldings);
    }

    @Override
    public double[] exposures() {
        return exposures.clone();
    }

    /**
     * @param securityIds per holding, the security's id, or a negative number for a security unknown to the panel
     * @param weights     per holding, a finite weight (negative for a short position)
     */
    public static PortfolioExposure of(LoadingsTable loadings, int[] securityIds, double[] weights) {
        if (loadings == null || securityIds == null || weights == null || securityIds.length != weights.length) {
            throw new IllegalArgumentException("need loadings and one weight per holding");
        }
        int k = loadings.factorCount();
        double[] exposures = new double[k];
        double gross = 0.0;
        double covered = 0.0;
        List<Integer> missing = new ArrayList<>();
        for (int h = 0; h < weights.length; h++) {
            double w = weights[h];
            if (!Double.isFinite(w)) {
                throw new IllegalArgumentException("weight of holding " + h + " is not a finite number");
            }
            gross += Math.abs(w);
            int row = securityIds[h] < 0 ? -1 : loadings.rowOf(securityIds[h]);
            if (row < 0 || !loadings.hasLoadings(row)) {
                missing.add(h);
                continue;
            }
            covered += Math.abs(w);
            for (int j = 0; j < k; j++) {
                exposures[j] += w * loadings.betas()[j][row];
            }
        }
        if (missing.size() == weights.length) {
            Arrays.fill(exposures, Double.NaN);
        }
        double coverage = gross > 0.0 ? covered / gross : Double.NaN;
        return new PortfolioExposure(exposures, coverage, missing);
    }
}
