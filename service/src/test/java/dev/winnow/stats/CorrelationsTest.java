package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.stats.Correlations.Method;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.apache.commons.math3.stat.correlation.PearsonsCorrelation;
import org.apache.commons.math3.stat.correlation.SpearmansCorrelation;
import org.apache.commons.math3.stat.ranking.NaNStrategy;
import org.apache.commons.math3.stat.ranking.NaturalRanking;
import org.apache.commons.math3.stat.ranking.TiesStrategy;
import org.junit.jupiter.api.Test;

class CorrelationsTest {

    private static final JsonNode FIXTURE = FixtureFiles.read("correlations.json");
    private static final SpearmansCorrelation COMMONS_SPEARMAN =
            new SpearmansCorrelation(new NaturalRanking(NaNStrategy.FAILED, TiesStrategy.AVERAGE));

    private static Map<String, ReturnSeries> fixtureSeries() {
        Map<String, ReturnSeries> series = new LinkedHashMap<>();
        for (JsonNode s : FIXTURE.get("series")) {
            series.put(s.get("name").asText(), FixtureFiles.series(s.get("dates"), s.get("values")));
        }
        return series;
    }

    private static void assertSameOrBothNaN(double expected, double actual, double tolerance, String label) {
        if (Double.isNaN(expected)) {
            assertTrue(Double.isNaN(actual), label + ": expected NaN, got " + actual);
        } else {
            assertEquals(expected, actual, tolerance, label);
        }
    }

    // Source: scipy.stats.pearsonr / spearmanr on inner-joined dates (scripts/correlation_fixtures.py, which also
    // cross-checks pandas DataFrame.corr with pairwise complete observations).
    @Test
    void pairwiseCorrelationsMatchScipy() {
        Map<String, ReturnSeries> series = fixtureSeries();
        for (JsonNode pair : FIXTURE.get("pairs")) {
            ReturnSeries a = series.get(pair.get("a").asText());
            ReturnSeries b = series.get(pair.get("b").asText());
            String label = pair.get("a").asText() + "/" + pair.get("b").asText();
            assertSameOrBothNaN(FixtureFiles.numberOrNaN(pair.get("pearson")), Correlations.correlation(a, b, Method.PEARSON), 1e-10, label);
            assertSameOrBothNaN(FixtureFiles.numberOrNaN(pair.get("spearman")), Correlations.correlation(a, b, Method.SPEARMAN), 1e-10, label);
        }
    }

    // Same source as above; the matrix aligns all series at once and must agree pair by pair, with the counts.
    @Test
    void matrixMatchesScipyPairByPair() {
        Map<String, ReturnSeries> series = fixtureSeries();
        List<String> names = new ArrayList<>(series.keySet());
        for (Method method : Method.values()) {
            CorrelationMatrix matrix = Correlations.matrix(new ArrayList<>(series.values()), method);
            assertEquals(names.size(), matrix.size());
            for (JsonNode pair : FIXTURE.get("pairs")) {
                int i = names.indexOf(pair.get("a").asText());
                int j = names.indexOf(pair.get("b").asText());
                String label = method + " " + pair.get("a").asText() + "/" + pair.get("b").asText();
                double expected = FixtureFiles.numberOrNaN(pair.get(method.name().toLowerCase()));
                assertSameOrBothNaN(expected, matrix.correlation(i, j), 1e-10, label);
                assertSameOrBothNaN(expected, matrix.correlation(j, i), 1e-10, label);
                assertEquals(pair.get("n").asInt(), matrix.observations(i, j), label);
                assertEquals(pair.get("n").asInt(), matrix.observations(j, i), label);
            }
            for (int i = 0; i < names.size(); i++) {
                assertEquals(series.get(names.get(i)).size(), matrix.observations(i, i));
                boolean flat = names.get(i).equals("flat");
                assertSameOrBothNaN(flat ? Double.NaN : 1.0, matrix.correlation(i, i), 0.0, names.get(i));
            }
        }
    }

    // Source: Commons Math PearsonsCorrelation and SpearmansCorrelation (NaturalRanking, TiesStrategy.AVERAGE).
    @Test
    void matchesCommonsMathOnTiedData() {
        Random random = new Random(42);
        for (int trial = 0; trial < 20; trial++) {
            int n = 3 + random.nextInt(200);
            double[] x = new double[n];
            double[] y = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = Math.round(random.nextGaussian() * 4) / 400.0; // coarse grid: many ties
                y[i] = 0.5 * x[i] + Math.round(random.nextGaussian() * 3) / 300.0;
            }
            x[0] = x[n - 1] + 0.01; // never constant
            y[0] = y[n - 1] + 0.01;
            assertEquals(new PearsonsCorrelation().correlation(x, y), Correlations.pearson(x, y), 1e-12);
            assertEquals(COMMONS_SPEARMAN.correlation(x, y), Correlations.spearman(x, y), 1e-12);
            assertArrayEquals(new NaturalRanking(NaNStrategy.FAILED, TiesStrategy.AVERAGE).rank(x), Correlations.averageRanks(x), 0.0);
        }
    }

    // Source: Commons Math NaturalRanking (TiesStrategy.AVERAGE). Values a few ulps apart share the high bits our
    // argsort packs indices under, so they must still be ranked by exact value, in short and in long runs.
    @Test
    void ranksValuesThatDifferOnlyInTheLastBits() {
        Random random = new Random(3);
        for (int size : new int[] {1, 2, 20, 500}) {
            double[] x = new double[size];
            for (int i = 0; i < size; i++) {
                double base = random.nextBoolean() ? 0.0123 : -0.0456;
                x[i] = base + random.nextInt(40) * Math.ulp(base);
            }
            assertArrayEquals(new NaturalRanking(NaNStrategy.FAILED, TiesStrategy.AVERAGE).rank(x), Correlations.averageRanks(x), 0.0);
        }
    }

    // Source: Commons Math PearsonsCorrelation / SpearmansCorrelation on full columns; here every series has every date,
    // which takes the matrix's shortcut that skips gathering and reuses whole-series ranks.
    @Test
    void fullyAlignedMatrixMatchesCommonsMath() {
        int k = 6;
        int n = 400;
        List<ReturnSeries> series = randomAligned(k, n, 7);
        double[][] columns = new double[n][k];
        for (int j = 0; j < k; j++) {
            for (int t = 0; t < n; t++) {
                columns[t][j] = series.get(j).value(t);
            }
        }
        double[][] pearson = new PearsonsCorrelation().computeCorrelationMatrix(columns).getData();
        double[][] spearman = COMMONS_SPEARMAN.computeCorrelationMatrix(columns).getData();
        double[][] ourPearson = Correlations.matrix(series, Method.PEARSON).matrix();
        double[][] ourSpearman = Correlations.matrix(series, Method.SPEARMAN).matrix();
        for (int i = 0; i < k; i++) {
            assertArrayEquals(pearson[i], ourPearson[i], 1e-12);
            assertArrayEquals(spearman[i], ourSpearman[i], 1e-12);
        }
    }

    @Test
    void spearmanWithTiesWorkedByHand() {
        // Worked by hand (invented scores of five fictional tea blends by two tasters):
        //   x = 1, 2, 2, 3, 4  -> ranks 1, 2.5, 2.5, 4, 5
        //   y = 2, 1, 3, 3, 5  -> ranks 2, 1, 3.5, 3.5, 5
        // Both rank means are 3; deviations dx = -2, -0.5, -0.5, 1, 2 and dy = -1, -2, 0.5, 0.5, 2.
        // sum dx dy = 2 + 1 - 0.25 + 0.5 + 4 = 7.25; sum dx^2 = sum dy^2 = 4 + 0.25 + 0.25 + 1 + 4 = 9.5.
        // rho = 7.25 / 9.5 = 29/38 = 0.76315789...
        double[] x = {1, 2, 2, 3, 4};
        double[] y = {2, 1, 3, 3, 5};
        assertArrayEquals(new double[] {1, 2.5, 2.5, 4, 5}, Correlations.averageRanks(x), 0.0);
        assertArrayEquals(new double[] {2, 1, 3.5, 3.5, 5}, Correlations.averageRanks(y), 0.0);
        assertEquals(29.0 / 38.0, Correlations.spearman(x, y), 1e-15);
    }

    @Test
    void fewerThanThreeObservationsOrNoVariationIsNaN() {
        assertTrue(Double.isNaN(Correlations.pearson(new double[] {0.1, 0.2}, new double[] {0.3, 0.1})));
        assertTrue(Double.isNaN(Correlations.spearman(new double[] {0.1, 0.2}, new double[] {0.3, 0.1})));
        assertTrue(Double.isNaN(Correlations.pearson(new double[] {0.1, 0.1, 0.1}, new double[] {0.3, 0.1, 0.2})));
        assertTrue(Double.isNaN(Correlations.spearman(new double[] {0.1, 0.2, 0.3}, new double[] {0.7, 0.7, 0.7})));
    }

    @Test
    void rollingEqualsOneShotOnEachWindow() {
        // Long series with a level shift and a flat stretch: running sums must stay accurate and flat windows NaN.
        int n = 3000;
        int window = 252;
        List<ReturnSeries> pair = randomAligned(2, n, 99);
        double[] x = pair.get(0).values();
        double[] y = pair.get(1).values();
        for (int t = 1000; t < 1500; t++) {
            x[t] += 0.05;
        }
        Arrays.fill(y, 2000, 2300, 0.0);
        LocalDate[] dates = pair.get(0).dates();
        ReturnSeries a = new ReturnSeries(dates, x);
        // b misses every 10th date, so the windows run over common dates only
        List<LocalDate> bDates = new ArrayList<>();
        List<Double> bValues = new ArrayList<>();
        for (int t = 0; t < n; t++) {
            if (t % 10 != 3) {
                bDates.add(dates[t]);
                bValues.add(y[t]);
            }
        }
        ReturnSeries b = new ReturnSeries(bDates.toArray(new LocalDate[0]), bValues.stream().mapToDouble(Double::doubleValue).toArray());
        DateAlignment.Common common = DateAlignment.common(a, b);
        int m = common.size();
        for (Method method : Method.values()) {
            RollingCorrelation rolling = Correlations.rolling(a, b, window, method);
            assertEquals(m - window + 1, rolling.size());
            assertArrayEquals(Arrays.copyOfRange(common.dates(), window - 1, m), rolling.dates());
            double[] values = rolling.values();
            int nanWindows = 0;
            for (int s = 0; s + window <= m; s++) {
                double[] wx = Arrays.copyOfRange(common.x(), s, s + window);
                double[] wy = Arrays.copyOfRange(common.y(), s, s + window);
                double expected = method == Method.PEARSON ? Correlations.pearson(wx, wy) : Correlations.spearman(wx, wy);
                assertSameOrBothNaN(expected, values[s], 1e-12, method + " window " + s);
                nanWindows += Double.isNaN(expected) ? 1 : 0;
            }
            assertTrue(nanWindows > 0, "the flat stretch must give undefined windows");
        }
        assertEquals(0, Correlations.rolling(a, b, m + 1, Method.PEARSON).size());
    }

    @Test
    void rollingPearsonStaysAccurateFarFromZeroAndAcrossJumps() {
        // Levels of 100 with noise of 0.01 and a jump to -50 halfway: naive running raw sums would lose ~8 digits here;
        // the shifted sums must still agree with the one-shot two-pass result to 1e-10.
        List<ReturnSeries> pair = randomAligned(2, 2000, 11);
        double[] x = pair.get(0).values();
        double[] y = pair.get(1).values();
        for (int t = 0; t < x.length; t++) {
            x[t] += t < 1000 ? 100.0 : -50.0;
            y[t] += 100.0 + t * 0.01;
        }
        int window = 100;
        RollingCorrelation rolling = Correlations.rolling(new ReturnSeries(pair.get(0).dates(), x),
                new ReturnSeries(pair.get(1).dates(), y), window, Method.PEARSON);
        double[] values = rolling.values();
        for (int s = 0; s + window <= x.length; s++) {
            double expected = Correlations.pearson(Arrays.copyOfRange(x, s, s + window), Arrays.copyOfRange(y, s, s + window));
            assertEquals(expected, values[s], 1e-10, "window " + s);
        }
    }

    @Test
    void rejectsBadArguments() {
        ReturnSeries s = randomAligned(1, 10, 1).get(0);
        assertThrows(IllegalArgumentException.class, () -> Correlations.rolling(s, s, 2, Method.PEARSON));
        assertThrows(IllegalArgumentException.class, () -> Correlations.rolling(s, s, 5, null));
        assertThrows(IllegalArgumentException.class, () -> Correlations.matrix(Arrays.asList(s, null), Method.PEARSON));
        assertThrows(IllegalArgumentException.class, () -> Correlations.pearson(new double[3], new double[4]));
    }

    static List<ReturnSeries> randomAligned(int k, int n, long seed) {
        Random random = new Random(seed);
        LocalDate[] dates = new LocalDate[n];
        for (int t = 0; t < n; t++) {
            dates[t] = LocalDate.of(2000, 1, 3).plusDays(t);
        }
        List<ReturnSeries> series = new ArrayList<>();
        double[] common = new double[n];
        for (int t = 0; t < n; t++) {
            common[t] = random.nextGaussian() * 0.01;
        }
        for (int j = 0; j < k; j++) {
            double[] v = new double[n];
            double loading = random.nextDouble() * 2 - 1;
            for (int t = 0; t < n; t++) {
                v[t] = 0.0003 + loading * common[t] + random.nextGaussian() * 0.01;
            }
            series.add(new ReturnSeries(dates, v));
        }
        return series;
    }
}
