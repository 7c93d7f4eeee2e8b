package dev.winnow.construct;

import dev.winnow.stats.LinearRegression;
import dev.winnow.stats.RegressionResult;
import dev.winnow.stats.ReturnSeries;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Simulation check (seeded): securities generated as r = a + F b + e with known betas b on three given factor
 * series come back within 3 classical standard errors (RegressionResult.standardErrors) of b. Under the model
 * about 99.73% of estimates fall within 3 standard errors (normal quantile), so we require at least 99% of
 * 900 estimates there, and every estimate within 5 standard errors.
 */
class SecurityLoadingsPlantedBetaTest {

    @Test
    void plantedBetasComeBackWithinThreeStandardErrors() {
        Random random = new Random(42);
        int dates = 300;
        int securities = 300;
        int window = 252;
        List<LocalDate> grid = new ArrayList<>();
        for (int t = 0; t < dates; t++) {
            grid.add(LocalDate.of(2020, 1, 1).plusDays(t));
        }
        double[][] f = new double[3][dates];
        List<ReturnSeries> factors = new ArrayList<>();
        for (double[] column : f) {
            for (int t = 0; t < dates; t++) {
                column[t] = 0.01 * random.nextGaussian();
            }
            factors.add(new ReturnSeries(grid.toArray(new LocalDate[0]), column));
        }
        double[][] planted = new double[securities][3];
        LoadingsTestPanel.Builder panel = LoadingsTestPanel.builder(grid);
        for (int i = 0; i < securities; i++) {
            for (int j = 0; j < 3; j++) {
                planted[i][j] = 1.0 + 0.5 * random.nextGaussian();
            }
            double noise = 0.005 + 0.02 * random.nextDouble();
            for (int t = 0; t < dates; t++) {
                boolean missing = i % 5 == 0 && random.nextDouble() < 0.1;
                double r = 0.0002 + planted[i][0] * f[0][t] + planted[i][1] * f[1][t] + planted[i][2] * f[2][t]
                        + noise * random.nextGaussian();
                panel.row(t, i + 1, missing ? Double.NaN : r);
            }
        }
        LoadingsTestPanel built = panel.build();
        int last = dates - 1;
        LoadingsTable table = SecurityLoadings.at(built, factors, last, window, window / 2);
        int within3 = 0;
        int total = 0;
        for (int i = 0; i < securities; i++) {
            double[][] x = new double[3][];
            for (int j = 0; j < 3; j++) {
                x[j] = java.util.Arrays.copyOfRange(f[j], last - window + 1, last + 1);
            }
            double[] y = new double[window];
            for (int t = 0; t < window; t++) {
                y[t] = built.crossSection(last - window + 1 + t).returns()[i];
            }
            RegressionResult reference = LinearRegression.fit(x, y);
            int row = table.rowOf(i + 1);
            assertEquals(reference.n(), table.usable()[row]);
            for (int j = 0; j < 3; j++) {
                double z = Math.abs(table.betas()[j][row] - planted[i][j]) / reference.standardErrors()[j + 1];
                assertTrue(z < 5, "security " + (i + 1) + " beta " + j + " is " + z + " standard errors off");
                within3 += z <= 3 ? 1 : 0;
                total++;
            }
        }
        assertTrue(within3 >= 0.99 * total, within3 + " of " + total + " within 3 standard errors");
    }
}
