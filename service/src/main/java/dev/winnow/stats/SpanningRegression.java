package dev.winnow.stats;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * Spanning regression: is a factor's return explained by other factors? On the dates the factor and every other
 * series have, the OLS regression with intercept r_t = alpha + sum_j beta_j f_jt + u_t ({@link LinearRegression});
 * alpha's t-statistic uses the Newey and West (1987, Econometrica 55(3)) standard error with Bartlett weights,
 * no small-sample correction, and the automatic lag count L = floor(4 (n/100)^(2/9)) for the regression's n
 * (Newey and West 1994). An alpha that is not significant means the others span the factor
 * (Huberman and Kandel 1987, Journal of Finance 42(4)).
 *
 * @param n            number of common dates used
 * @param alpha        intercept per period
 * @param alphaNwTStat alpha / its Newey-West standard error
 * @param nwLags       lags used
 * @param betas        slope per other series, in input order
 * @param rSquared     1 - SSR / SST
 */
public record SpanningRegression(int n, double alpha, double alphaNwTStat, int nwLags, double[] betas, double rSquared) {

    public SpanningRegression {
        betas = AnalyticsChecks.notNull(betas, "betas").clone();
    }

    @Override
    public double[] betas() {
        return betas.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof SpanningRegression r && n == r.n && nwLags == r.nwLags && Double.compare(alpha, r.alpha) == 0
                && Double.compare(alphaNwTStat, r.alphaNwTStat) == 0 && Arrays.equals(betas, r.betas)
                && Double.compare(rSquared, r.rSquared) == 0;
    }

    @Override
    public int hashCode() {
        return Objects.hash(n, alpha, alphaNwTStat, nwLags, Arrays.hashCode(betas), rSquared);
    }

    @Override
    public String toString() {
        return "SpanningRegression[n=" + n + ", alpha=" + alpha + ", alphaNwTStat=" + alphaNwTStat + ", nwLags=" + nwLags
                + ", betas=" + Arrays.toString(betas) + ", rSquared=" + rSquared + "]";
    }

    /** Number of dates both series have (the common months of two monthly series). */
    public static int commonDates(ReturnSeries a, ReturnSeries b) {
        AnalyticsChecks.notNull(a, "a");
        AnalyticsChecks.notNull(b, "b");
        return DateAlignment.common(a, b).size();
    }

    /**
     * Regresses {@code factor} on {@code others} over their common dates. Every statistic is NaN when there is no
     * other series, when the common dates leave no residual degrees of freedom (n &lt;= K + 1) or when the others are
     * collinear.
     */
    public static SpanningRegression of(ReturnSeries factor, List<ReturnSeries> others) {
        AnalyticsChecks.notNull(factor, "factor");
        AnalyticsChecks.notNull(others, "others");
        List<ReturnSeries> all = new ArrayList<>();
        all.add(factor);
        for (int j = 0; j < others.size(); j++) {
            all.add(AnalyticsChecks.notNull(others.get(j), "others[" + j + "]"));
        }
        CommonDates common = CommonDates.of(all);
        int n = common.size();
        int k = others.size();
        int lags = NeweyWest.automaticLags(n);
        if (k == 0 || n <= k + 1) {
            double[] nanBetas = new double[k];
            Arrays.fill(nanBetas, Double.NaN);
            return new SpanningRegression(n, Double.NaN, Double.NaN, lags, nanBetas, Double.NaN);
        }
        double[] y = common.values()[0];
        double[][] x = Arrays.copyOfRange(common.values(), 1, k + 1);
        RegressionResult fit = LinearRegression.fit(x, y);
        double t = LinearRegression.neweyWestAlphaT(x, y, lags);
        return new SpanningRegression(n, fit.alpha(), t, lags, fit.betas(), fit.rSquared());
    }
}
