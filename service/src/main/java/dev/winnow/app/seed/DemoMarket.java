package dev.winnow.app.seed;

import java.io.IOException;
import java.io.Writer;
import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;

/**
 * Simulates the demo market month by month and writes its panel rows. The return model is this scenario's own
 * specification, a linear model of expected returns on a market factor and firm characteristics; for a company i
 * listed in months t and t+1:
 *
 * <pre>
 *   r_{i,t+1} = rf_{t+1} + beta_i * mkt_{t+1} + s_{g(i),t+1} + sum_k lambda_k * z_{k,i,t} + lambda_size * z_{size,i,t}
 *               + sigma_i * e_{i,t+1}
 * </pre>
 *
 * where z_{k,i,t} is the cross-sectional z-score at month t of characteristic k exactly as published in the panel,
 * (x - mean) / sample standard deviation over the companies with a published value, and 0 where the value is missing;
 * z_size is the same for ln(market_cap); s is the sector shock and e is unit-variance Student t(5) noise. Signals
 * known at t therefore price returns at t+1 only. Market caps compound with returns. In a delisting month the model
 * return is compounded with the delisting return; returns are floored at -95%.
 *
 * <p>{@code momentum_12_1} at t is prod_{s=t-11}^{t-1} (1 + r_s) - 1: the eleven returns that end one month before t,
 * skipping the latest (Jegadeesh and Titman, Journal of Finance 48, 1993, with the customary one-month skip);
 * missing until eleven returns exist.
 */
final class DemoMarket {

    /** Unpublished months simulated first so that momentum exists in the first published month. */
    static final int BURN_IN = 12;
    private static final int MOMENTUM_RETURNS = 11;
    private static final int RETURN_MEMORY = MOMENTUM_RETURNS + 1;
    private static final int IDIOSYNCRATIC_DEGREES_OF_FREEDOM = 5;
    private static final double MISSING_CHARACTERISTIC = 0.03;
    private static final double MISSING_MARKET_CAP = 0.005;
    private static final double WORST_RETURN = -0.95;

    private final List<DemoCompany> companies;
    private final DemoMacro macro;
    private final List<LocalDate> dates;
    private final double[] characteristicPremia;
    private final double sizePremium;
    private final SeededDraws shocks;
    private final SeededDraws gaps;

    private final Characteristic[] latentCharacteristics = Characteristic.values();
    private final double[] monthlyPersistence = Arrays.stream(latentCharacteristics).mapToDouble(c -> c.persistence(1)).toArray();
    private final double[][] latent;
    private final double[] marketCap;
    private final double[][] recentReturns;
    /** Published values of the current month: characteristics in panel order, then ln(market_cap). */
    private final double[][] signals;
    private final double[] returns;
    private final double[] caps;
    /** z-scores of {@link #signals} from the previous month, which price this month's returns. */
    private final double[][] previousZ;

    DemoMarket(List<DemoCompany> companies, DemoMacro macro, List<LocalDate> dates, PlantedPremia premia,
               SeededDraws shocks, SeededDraws gaps) {
        this.companies = companies;
        this.macro = macro;
        this.dates = dates;
        this.characteristicPremia = premia.perCharacteristic();
        this.sizePremium = premia.logMarketCap();
        this.shocks = shocks;
        this.gaps = gaps;
        int n = companies.size();
        int signalCount = PanelLayout.CHARACTERISTICS.size() + 1;
        latent = new double[n][latentCharacteristics.length];
        marketCap = new double[n];
        recentReturns = new double[n][RETURN_MEMORY];
        signals = new double[n][signalCount];
        returns = new double[n];
        caps = new double[n];
        previousZ = new double[n][signalCount];
    }

    /** Simulates burn-in and sample, writing the header and one row per listed company and published month. */
    void run(Writer panel) throws IOException {
        panel.write(PanelLayout.HEADER);
        panel.write('\n');
        StringBuilder row = new StringBuilder(256);
        int characteristicCount = PanelLayout.CHARACTERISTICS.size();
        for (int t = -BURN_IN; t < dates.size(); t++) {
            for (int i = 0; i < companies.size(); i++) {
                if (companies.get(i).listedIn(t)) {
                    returns[i] = t == companies.get(i).firstMonth() ? list(i) : advance(i, t);
                    publish(i, t);
                }
            }
            double[][] z = zScores(t);
            for (int i = 0; i < companies.size(); i++) {
                DemoCompany company = companies.get(i);
                if (!company.listedIn(t)) {
                    continue;
                }
                previousZ[i] = z[i];
                if (t >= 0) {
                    row.setLength(0);
                    PanelLayout.appendRow(row, dates.get(t).toString(), company.security(), returns[i], caps[i],
                            Arrays.copyOf(signals[i], characteristicCount), company.sector(), company.tier());
                    panel.append(row);
                }
            }
        }
    }

    /** First month of a listing: stationary characteristics, the initial market cap and no return yet. */
    private double list(int i) {
        for (int k = 0; k < latentCharacteristics.length; k++) {
            latent[i][k] = shocks.gaussian();
        }
        marketCap[i] = companies.get(i).initialMarketCap();
        Arrays.fill(recentReturns[i], Double.NaN);
        return Double.NaN;
    }

    private double advance(int i, int t) {
        DemoCompany company = companies.get(i);
        int m = t + BURN_IN;
        double expected = macro.riskFree(m) + company.beta() * macro.marketExcess(m)
                + macro.sectorShock(m, PanelLayout.SECTORS.indexOf(company.sector()));
        double[] z = previousZ[i];
        for (int k = 0; k < characteristicPremia.length; k++) {
            expected += characteristicPremia[k] * z[k];
        }
        expected += sizePremium * z[characteristicPremia.length];
        double r = expected + company.idiosyncraticVolatility() * shocks.unitStudentT(IDIOSYNCRATIC_DEGREES_OF_FREEDOM);
        if (t == company.lastMonth() && company.delists()) {
            r = (1.0 + r) * (1.0 + company.delistingReturn()) - 1.0;
        }
        r = PanelLayout.published(Math.max(WORST_RETURN, r));
        marketCap[i] *= 1.0 + r;
        for (int k = 0; k < latentCharacteristics.length; k++) {
            latent[i][k] = Characteristic.step(latent[i][k], monthlyPersistence[k], shocks.gaussian());
        }
        return r;
    }

    /** Fills this month's published characteristics, ln(market cap) and cap of company i, with random gaps. */
    private void publish(int i, int t) {
        recentReturns[i][Math.floorMod(t, RETURN_MEMORY)] = returns[i];
        double[] values = signals[i];
        for (int k = 0; k < latentCharacteristics.length; k++) {
            Characteristic c = latentCharacteristics[k];
            double value = PanelLayout.published(c.fromLatent(latent[i][k]));
            values[c.columnIndex()] = gaps.chance(MISSING_CHARACTERISTIC) ? Double.NaN : value;
        }
        int momentumColumn = PanelLayout.CHARACTERISTICS.indexOf("momentum_12_1");
        double momentum = PanelLayout.published(momentum(i, t));
        values[momentumColumn] = gaps.chance(MISSING_CHARACTERISTIC) ? Double.NaN : momentum;
        caps[i] = gaps.chance(MISSING_MARKET_CAP) ? Double.NaN : PanelLayout.published(marketCap[i]);
        values[values.length - 1] = StrictMath.log(caps[i]);
    }

    private double momentum(int i, int t) {
        double growth = 1.0;
        for (int s = t - MOMENTUM_RETURNS; s < t; s++) {
            growth *= 1.0 + recentReturns[i][Math.floorMod(s, RETURN_MEMORY)];
        }
        return growth - 1.0; // NaN while fewer than eleven returns exist
    }

    /** Cross-sectional z-scores of every signal over the companies listed at t; 0 where a value is missing. */
    private double[][] zScores(int t) {
        int n = companies.size();
        int signalCount = previousZ[0].length;
        double[][] z = new double[n][signalCount];
        for (int j = 0; j < signalCount; j++) {
            double sum = 0.0;
            int count = 0;
            for (int i = 0; i < n; i++) {
                if (companies.get(i).listedIn(t) && !Double.isNaN(signals[i][j])) {
                    sum += signals[i][j];
                    count++;
                }
            }
            if (count < 2) {
                continue;
            }
            double mean = sum / count;
            double squares = 0.0;
            for (int i = 0; i < n; i++) {
                if (companies.get(i).listedIn(t) && !Double.isNaN(signals[i][j])) {
                    double d = signals[i][j] - mean;
                    squares += d * d;
                }
            }
            double sd = StrictMath.sqrt(squares / (count - 1));
            for (int i = 0; i < n; i++) {
                if (companies.get(i).listedIn(t) && !Double.isNaN(signals[i][j]) && sd > 0) {
                    z[i][j] = (signals[i][j] - mean) / sd;
                }
            }
        }
        return z;
    }
}
