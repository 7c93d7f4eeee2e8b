package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.apache.commons.math3.stat.inference.TTest;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * A check of the generator against its own specification, not of any Winnow statistic: the committed demo panel
 * must carry the premia {@link PlantedPremia#DEMO} plants and nothing on the noise characteristics.
 *
 * <p>Signals are rebuilt from the panel as the specification defines them (cross-sectional z-score at t, 0 where a
 * value is missing; ln(market_cap) for size) and returns are those of t+1. Regressions are done by Commons Math
 * {@link OLSMultipleLinearRegression} and t-statistics by Commons Math {@link TTest} (a general-purpose reference
 * library).
 */
class DemoScenarioPlantedTruthTest {

    private static final List<String> SIGNALS = signalNames();
    private static final int SIZE = SIGNALS.size() - 1;
    private static final List<String> NOISE = List.of("noise_alpha", "noise_beta", "noise_gamma");

    private static List<List<Row>> months;

    /** One security at month t: its return in t+1, its z-scored signals at t and the raw published signals at t. */
    record Row(String security, double nextReturn, double[] signals, double[] raw) {
        double rawSignal(int k) {
            return raw[k];
        }
    }

    @BeforeAll
    static void readCommittedPanel() throws IOException {
        months = pairWithNextReturns(readPanel());
    }

    /**
     * Fama-MacBeth (Fama and MacBeth, Journal of Political Economy 81, 1973): each month regress next-month returns
     * on the z-scores of all eight signals, then test the time-series mean of each slope against zero. Planted
     * signals must show their planted sign with |t| > 3; noise signals must show |t| < 3 (the threshold is ours: a
     * true zero premium gives |t| > 3 in about 0.3% of samples).
     */
    @Test
    void crossSectionalSlopesRecoverThePlantedSigns() {
        List<double[]> slopes = new ArrayList<>();
        for (List<Row> month : months) {
            double[][] x = new double[month.size()][];
            double[] y = new double[month.size()];
            for (int i = 0; i < month.size(); i++) {
                x[i] = month.get(i).signals();
                y[i] = month.get(i).nextReturn();
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.newSampleData(y, x);
            double[] beta = ols.estimateRegressionParameters();
            slopes.add(Arrays.copyOfRange(beta, 1, beta.length));
        }
        double[] planted = plantedPremia();
        for (int k = 0; k < SIGNALS.size(); k++) {
            final int signal = k;
            double t = new TTest().t(0.0, slopes.stream().mapToDouble(s -> s[signal]).toArray());
            if (planted[k] == 0.0) {
                assertTrue(Math.abs(t) < 3.0, SIGNALS.get(k) + " is noise but its slope has t = " + t);
            } else {
                assertEquals(Math.signum(planted[k]), Math.signum(t), SIGNALS.get(k) + " slope has the wrong sign, t = " + t);
                assertTrue(Math.abs(t) > 3.0, SIGNALS.get(k) + " slope is too weak, t = " + t);
            }
        }
    }

    /**
     * The calibration the scenario promises: an equal-weighted top-minus-bottom quintile sort earns a monthly mean
     * with t between 3.5 and 6 on each planted characteristic (low minus high for asset growth) and |t| < 2 on each
     * noise characteristic.
     */
    @Test
    void equalWeightedQuintileSpreadsHaveTheCalibratedStrength() {
        double[] planted = plantedPremia();
        for (int k = 0; k < SIZE; k++) {
            double t = new TTest().t(0.0, quintileSpreads(k, Math.signum(planted[k]) < 0 ? -1 : 1));
            if (NOISE.contains(SIGNALS.get(k))) {
                assertTrue(Math.abs(t) < 2.0, SIGNALS.get(k) + " is noise but its quintile spread has t = " + t);
            } else {
                assertTrue(t > 3.5 && t < 6.0, SIGNALS.get(k) + " quintile spread t = " + t + " is outside 3.5..6");
            }
        }
    }

    /** Top-minus-bottom quintile mean next return per month (times {@code sign}), ranks tied by file order. */
    private static double[] quintileSpreads(int signal, int sign) {
        double[] spreads = new double[months.size()];
        for (int m = 0; m < months.size(); m++) {
            List<Row> ranked = new ArrayList<>();
            for (Row row : months.get(m)) {
                if (!Double.isNaN(row.rawSignal(signal))) {
                    ranked.add(row);
                }
            }
            ranked.sort(Comparator.comparingDouble(r -> r.rawSignal(signal)));
            int n = ranked.size();
            double top = 0;
            double bottom = 0;
            int topCount = 0;
            int bottomCount = 0;
            for (int i = 0; i < n; i++) {
                int quintile = (int) Math.ceil((i + 1) * 5.0 / n);
                if (quintile == 5) {
                    top += ranked.get(i).nextReturn();
                    topCount++;
                } else if (quintile == 1) {
                    bottom += ranked.get(i).nextReturn();
                    bottomCount++;
                }
            }
            spreads[m] = sign * (top / topCount - bottom / bottomCount);
        }
        return spreads;
    }

    private static double[] plantedPremia() {
        double[] premia = Arrays.copyOf(PlantedPremia.DEMO.perCharacteristic(), SIGNALS.size());
        premia[SIZE] = PlantedPremia.DEMO.logMarketCap();
        return premia;
    }

    private static List<String> signalNames() {
        List<String> names = new ArrayList<>(PanelLayout.CHARACTERISTICS);
        names.add("log_market_cap");
        return List.copyOf(names);
    }

    /** date -> security -> [return, raw signals...] with NaN for empty cells, from the committed panel. */
    private static Map<LocalDate, Map<String, double[]>> readPanel() throws IOException {
        Map<LocalDate, Map<String, double[]>> panel = new TreeMap<>();
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                SeedDataFolder.openContent(SeedDataFolder.locate().resolve(DemoScenarioGenerator.PANEL_FILE)),
                StandardCharsets.UTF_8))) {
            String[] header = in.readLine().split(",", -1);
            assertEquals("return", header[2]);
            assertEquals("market_cap", header[3]);
            for (String line = in.readLine(); line != null; line = in.readLine()) {
                String[] cells = line.split(",", -1);
                double[] values = new double[1 + SIGNALS.size()];
                values[0] = number(cells[2]);
                for (int k = 0; k < SIZE; k++) {
                    values[1 + k] = number(cells[4 + k]);
                }
                values[1 + SIZE] = Math.log(number(cells[3]));
                panel.computeIfAbsent(LocalDate.parse(cells[0]), d -> new LinkedHashMap<>()).put(cells[1], values);
            }
        }
        return panel;
    }

    private static double number(String cell) {
        return cell.isEmpty() ? Double.NaN : Double.parseDouble(cell);
    }

    /** For each month but the last: rows of securities that also have a return next month, with z-scores at t. */
    private static List<List<Row>> pairWithNextReturns(Map<LocalDate, Map<String, double[]>> panel) {
        List<Map<String, double[]>> byDate = new ArrayList<>(panel.values());
        List<List<Row>> result = new ArrayList<>();
        for (int t = 0; t + 1 < byDate.size(); t++) {
            Map<String, double[]> now = byDate.get(t);
            double[][] z = zScores(now);
            List<Row> rows = new ArrayList<>();
            int i = 0;
            for (Map.Entry<String, double[]> entry : now.entrySet()) {
                double[] next = byDate.get(t + 1).get(entry.getKey());
                if (next != null && !Double.isNaN(next[0])) {
                    rows.add(new Row(entry.getKey(), next[0], z[i], Arrays.copyOfRange(entry.getValue(), 1, entry.getValue().length)));
                }
                i++;
            }
            result.add(rows);
        }
        return result;
    }

    /** (x - mean) / sample standard deviation over the rows with a value; 0 where the value is missing. */
    private static double[][] zScores(Map<String, double[]> month) {
        List<double[]> rows = new ArrayList<>(month.values());
        double[][] z = new double[rows.size()][SIGNALS.size()];
        for (int k = 0; k < SIGNALS.size(); k++) {
            final int column = 1 + k;
            double[] present = rows.stream().mapToDouble(r -> r[column]).filter(v -> !Double.isNaN(v)).toArray();
            double mean = Arrays.stream(present).average().orElse(Double.NaN);
            double sd = Math.sqrt(Arrays.stream(present).map(v -> (v - mean) * (v - mean)).sum() / (present.length - 1));
            for (int i = 0; i < rows.size(); i++) {
                double v = rows.get(i)[column];
                z[i][k] = Double.isNaN(v) ? 0.0 : (v - mean) / sd;
            }
        }
        return z;
    }
}
