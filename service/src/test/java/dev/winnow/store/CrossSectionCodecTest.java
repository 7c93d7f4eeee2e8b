package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import org.junit.jupiter.api.Test;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Encoding and decoding a slice gives back every value's 64 bits, whatever the values. */
class CrossSectionCodecTest {
    private static final LocalDate DATE = LocalDate.of(2024, 3, 28);

    @Test
    void shortDecimalsTakeAboutFourBytesAndComeBackBitForBit() {
        SplittableRandom random = new SplittableRandom(12);
        int n = 3000;
        double[] returns = new double[n];
        double[] caps = new double[n];
        double[] signal = new double[n];
        for (int i = 0; i < n; i++) {
            // what a CSV with 8 significant digits holds, parsed the way the JDK parses it
            returns[i] = Double.parseDouble(String.format(Locale.ROOT, "%.7e", 0.02 * random.nextGaussian()));
            caps[i] = Double.parseDouble(String.format(Locale.ROOT, "%.7e", Math.exp(7 + 2 * random.nextGaussian())));
            signal[i] = i % 50 == 0 ? Double.NaN : Double.parseDouble(String.format(Locale.ROOT, "%.4f", random.nextGaussian()));
        }
        CrossSection cs = section(n, returns, caps, Map.of("signal", signal), Map.of());
        byte[] payload = CrossSectionCodec.encode(cs);
        assertSame(cs, CrossSectionCodec.decode(DATE, payload));
        assertTrue(payload.length < n * (4 + 4 + 4) + 200, "payload " + payload.length + " bytes for " + n + " rows of 3 numbers");
    }

    @Test
    void aColumnWithExponentsOfBothSignsComesBackBitForBit() {
        // whole numbers above 2^27 (2e9 is 20000000 at exponent -2; the significand must stay below 2^27) beside
        // four-decimal values (exponent 4) in one decimal block, with missing values and a few that need all their bits
        SplittableRandom random = new SplittableRandom(31);
        int n = 3000;
        double[] mixed = new double[n];
        for (int i = 0; i < n; i++) {
            mixed[i] = switch (i % 4) {
                case 0 -> 1e9 * (1 + random.nextInt(90));
                case 1 -> Double.parseDouble(String.format(Locale.ROOT, "%.4f", 100 * random.nextDouble()));
                case 2 -> i % 40 == 2 ? Double.NaN : -1e12 * (1 + random.nextInt(90));
                default -> i % 300 == 3 ? random.nextDouble() / 3 : Double.parseDouble(String.format(Locale.ROOT, "%.2f", random.nextGaussian()));
            };
        }
        double[] plain = new double[n];
        CrossSection cs = section(n, mixed, plain, Map.of(), Map.of());
        byte[] payload = CrossSectionCodec.encode(cs);
        assertSame(cs, CrossSectionCodec.decode(DATE, payload));
        assertTrue(payload.length < n * (4 + 4 + 4) + 200, "the mixed column stays a decimal block: " + payload.length + " bytes");
    }

    @Test
    void anyBitsComeBack() {
        SplittableRandom random = new SplittableRandom(7);
        double[] special = {0.0, -0.0, Double.NaN, Double.longBitsToDouble(0x7ff8000000000001L), Double.longBitsToDouble(0xfff8000000000000L),
            Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, Double.MIN_VALUE, -Double.MIN_VALUE, Double.MIN_NORMAL,
            Double.MAX_VALUE, -Double.MAX_VALUE, 1e22, 1e23, 1e-22, 1e-23, 0.1, 1.0 / 3, 134217727, 134217728, 1e29, 1.2345678e29,
            123456789e20, 5e-324, 0.012345678, -0.012345678, 99999999, 1e15, 1e-15, 12345678e-22};
        for (int round = 0; round < 200; round++) {
            int n = 1 + random.nextInt(400);
            double[][] columns = new double[3][n];
            for (double[] column : columns) {
                for (int i = 0; i < n; i++) {
                    column[i] = switch (random.nextInt(5)) {
                        case 0 -> special[random.nextInt(special.length)];
                        case 1 -> Double.longBitsToDouble(random.nextLong());
                        case 2 -> random.nextGaussian() * Math.pow(10, random.nextInt(-30, 30));
                        default -> Double.parseDouble(String.format(Locale.ROOT, "%." + random.nextInt(0, 9) + "e",
                                random.nextGaussian() * Math.pow(10, random.nextInt(-25, 30))));
                    };
                }
            }
            String[] labels = new String[n];
            for (int i = 0; i < n; i++) {
                labels[i] = random.nextInt(7) == 0 ? null : "tier-" + random.nextInt(1 + round % 300) + (round % 2 == 0 ? "é" : "");
            }
            CrossSection cs = section(n, columns[0], columns[1], Map.of("x", columns[2]), Map.of("tier", labels));
            assertSame(cs, CrossSectionCodec.decode(DATE, CrossSectionCodec.encode(cs)));
        }
    }

    @Test
    void idsWithGapsAndASingleRowComeBack() {
        int[] ids = {0, 1, 2, 7, 8, 1000, 1001, 1002, 1003, Integer.MAX_VALUE};
        double[] x = new double[ids.length];
        CrossSection cs = new CrossSection(DATE, ids, x, x, Map.of(), Map.of("l", new String[ids.length]));
        assertSame(cs, CrossSectionCodec.decode(DATE, CrossSectionCodec.encode(cs)));
        CrossSection one = new CrossSection(DATE, new int[] {5}, new double[] {0.5}, new double[] {Double.NaN}, Map.of(), Map.of());
        assertSame(one, CrossSectionCodec.decode(DATE, CrossSectionCodec.encode(one)));
        CrossSection empty = new CrossSection(DATE, new int[0], new double[0], new double[0], Map.of("a", new double[0]), Map.of());
        assertSame(empty, CrossSectionCodec.decode(DATE, CrossSectionCodec.encode(empty)));
    }

    @Test
    void aReaderCanSkipColumns() {
        double[] v = {1.5, 2.5};
        CrossSection cs = new CrossSection(DATE, new int[] {1, 2}, v, v, orderedNumbers("a", v, "b", new double[] {3, 4}),
                Map.of("l", new String[] {"x", null}));
        CrossSection some = CrossSectionCodec.decode(DATE, CrossSectionCodec.encode(cs), "b"::equals);
        assertEquals(1, some.numbers().size());
        assertArrayEquals(new double[] {3, 4}, some.numbers().get("b"));
        assertTrue(some.labels().isEmpty());
        assertNull(some.labelColumn("l")[0]);
    }

    /** A slice written in encoding version 1, by hand from its documented layout, still reads. */
    @Test
    void version1SlicesStayReadable() {
        byte[] name = "score".getBytes(StandardCharsets.UTF_8);
        byte[] label = "sector".getBytes(StandardCharsets.UTF_8);
        byte[] value = "Mossfield".getBytes(StandardCharsets.UTF_8);
        ByteBuffer b = ByteBuffer.allocate(512);
        b.putInt(1).putInt(2).putInt(3).putInt(9);
        b.putDouble(0.01).putDouble(-0.02).putDouble(100).putDouble(Double.NaN);
        b.putInt(1).putInt(name.length).put(name).putDouble(1.25).putDouble(-7);
        b.putInt(1).putInt(label.length).put(label).putInt(1).putInt(value.length).put(value).putInt(0).putInt(-1);
        CrossSection cs = CrossSectionCodec.decode(DATE, java.util.Arrays.copyOf(b.array(), b.position()));
        assertArrayEquals(new int[] {3, 9}, cs.securityIds());
        assertArrayEquals(new double[] {0.01, -0.02}, cs.returns());
        assertArrayEquals(new double[] {1.25, -7}, cs.numberColumn("score"));
        assertArrayEquals(new String[] {"Mossfield", null}, cs.labelColumn("sector"));
        assertTrue(Double.isNaN(cs.marketCaps()[1]));
    }

    private static Map<String, double[]> orderedNumbers(String a, double[] va, String b, double[] vb) {
        Map<String, double[]> m = new LinkedHashMap<>();
        m.put(a, va);
        m.put(b, vb);
        return m;
    }

    private static CrossSection section(int n, double[] returns, double[] caps, Map<String, double[]> numbers, Map<String, String[]> labels) {
        int[] ids = new int[n];
        for (int i = 0; i < n; i++) {
            ids[i] = 1 + i + (i > n / 2 ? 5 : 0);
        }
        return new CrossSection(DATE, ids, returns, caps, numbers, labels);
    }

    private static void assertSame(CrossSection expected, CrossSection actual) {
        assertEquals(expected.date(), actual.date());
        assertArrayEquals(expected.securityIds(), actual.securityIds());
        assertBits(expected.returns(), actual.returns());
        assertBits(expected.marketCaps(), actual.marketCaps());
        assertEquals(expected.numbers().keySet(), actual.numbers().keySet());
        expected.numbers().forEach((k, v) -> assertBits(v, actual.numbers().get(k)));
        assertEquals(expected.labels().keySet(), actual.labels().keySet());
        expected.labels().forEach((k, v) -> assertArrayEquals(v, actual.labels().get(k)));
    }

    private static void assertBits(double[] expected, double[] actual) {
        assertEquals(expected.length, actual.length);
        for (int i = 0; i < expected.length; i++) {
            assertEquals(Double.doubleToRawLongBits(expected[i]), Double.doubleToRawLongBits(actual[i]),
                    "row " + i + ": " + expected[i] + " came back as " + actual[i]);
        }
    }
}
