package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * NIST StRD Longley (fixtures/nist_longley.dat, certified values to 15 digits) run through the service's loadings
 * path: 16 annual "dates", the response as one security's return and the 6 regressors as factor series.
 * Coefficients, residual SD and R^2 must match the certified values to 1e-8 relative.
 */
class SecurityLoadingsLongleyTest {
    private static final int SECURITY = 7;

    @Test
    void everyLoadingsPathReproducesCertifiedValues() {
        Longley longley = Longley.read();
        int last = longley.dates().size() - 1;
        LoadingsTable atDate = SecurityLoadings.at(longley.panel(), longley.factors(), last, 16, 16);
        assertCertified(longley, atDate, atDate.rowOf(SECURITY));

        List<LoadingsTable> slid = new ArrayList<>();
        SecurityLoadings.slide(longley.panel(), FactorGrid.align(longley.factors(), longley.dates()), last, last, 16, 16, slid::add);
        assertEquals(atDate, slid.get(0), "sliding path equals the one-date path bit for bit");

        SecurityLoadingsHistory history = SecurityLoadings.history(longley.panel(),
                FactorGrid.align(longley.factors(), longley.dates()), SECURITY, last, last, 16, 16);
        assertEquals(16, history.usable()[0]);
        assertEquals(atDate.alpha()[0], history.alpha()[0]);
        assertEquals(atDate.residualVol()[0], history.residualVol()[0]);
    }

    private static void assertCertified(Longley longley, LoadingsTable table, int row) {
        assertEquals(16, table.usable()[row]);
        assertRelative(longley.coefficients()[0], table.alpha()[row], "b0");
        for (int j = 0; j < 6; j++) {
            assertRelative(longley.coefficients()[j + 1], table.betas()[j][row], "b" + (j + 1));
        }
        assertRelative(longley.residualSd(), table.residualVol()[row], "residual SD");
        assertRelative(longley.rSquared(), table.rSquared()[row], "R^2");
    }

    private static void assertRelative(double expected, double actual, String what) {
        assertEquals(expected, actual, Math.abs(expected) * 1e-8, what);
    }

    private record Longley(List<LocalDate> dates, LoadingsTestPanel panel, List<ReturnSeries> factors, double[] coefficients,
                           double residualSd, double rSquared) {
        static Longley read() {
            List<String[]> lines = Arrays.stream(LoadingsTestPanel.fixture("nist_longley.dat").split("\n"))
                    .map(l -> l.trim().split("\\s+")).toList();
            List<double[]> data = lines.stream().filter(f -> f[0].equals("data"))
                    .map(f -> Arrays.stream(f, 1, 8).mapToDouble(Double::parseDouble).toArray()).toList();
            Map<String, Double> certified = new HashMap<>();
            lines.stream().filter(f -> f[0].equals("certified")).forEach(f -> certified.put(f[1], Double.parseDouble(f[2])));
            double[] coefficients = IntStream.range(0, 7).mapToDouble(j -> certified.get("b" + j)).toArray();
            double residualSd = certified.get("residual_sd");
            double rSquared = certified.get("r_squared");
            List<LocalDate> dates = new ArrayList<>();
            for (double[] row : data) {
                dates.add(LocalDate.of((int) row[6], 12, 31));
            }
            LoadingsTestPanel.Builder panel = LoadingsTestPanel.builder(dates);
            for (int t = 0; t < data.size(); t++) {
                panel.row(t, SECURITY, data.get(t)[0]);
            }
            List<ReturnSeries> factors = new ArrayList<>();
            for (int j = 1; j <= 6; j++) {
                double[] values = new double[data.size()];
                for (int t = 0; t < values.length; t++) {
                    values[t] = data.get(t)[j];
                }
                factors.add(new ReturnSeries(dates.toArray(new LocalDate[0]), values));
            }
            return new Longley(dates, panel.build(), factors, coefficients, residualSd, rSquared);
        }
    }
}
