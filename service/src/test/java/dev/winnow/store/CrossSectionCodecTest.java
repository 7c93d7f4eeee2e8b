package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A slice decodes to the cross-section encoded, bit for bit; a projected decode keeps exactly the columns asked for. */
class CrossSectionCodecTest {

    private static CrossSection sample() {
        Map<String, double[]> numbers = new LinkedHashMap<>();
        numbers.put("book_to_price", new double[] {0.5, Double.NaN, -0.0});
        numbers.put("momentum_12_1", new double[] {0.1, 0.2, 0.3});
        numbers.put("noise_alpha", new double[] {Double.longBitsToDouble(0x7ff8000000000123L), 1e-300, -2.5});
        Map<String, String[]> labels = new LinkedHashMap<>();
        labels.put("sector", new String[] {"Ferrolith", null, "Skyloom"});
        labels.put("listing_tier", new String[] {"main", "growth", "main"});
        return new CrossSection(LocalDate.of(2020, 1, 31), new int[] {3, 7, 9}, new double[] {0.01, Double.NaN, -0.02},
                new double[] {100, 2000, Double.NaN}, numbers, labels);
    }

    @Test
    void decodesWhatWasEncoded() {
        CrossSection cs = sample();
        CrossSection back = CrossSectionCodec.decode(cs.date(), CrossSectionCodec.encode(cs));
        assertArrayEquals(cs.securityIds(), back.securityIds());
        assertBits(cs.returns(), back.returns());
        assertBits(cs.marketCaps(), back.marketCaps());
        assertEquals(cs.numbers().keySet(), back.numbers().keySet());
        cs.numbers().forEach((name, values) -> assertBits(values, back.numbers().get(name)));
        assertEquals(cs.labels().keySet(), back.labels().keySet());
        cs.labels().forEach((name, values) -> assertArrayEquals(values, back.labels().get(name)));
    }

    @Test
    void aProjectedDecodeKeepsOnlyTheColumnsAskedFor() {
        CrossSection cs = sample();
        byte[] payload = CrossSectionCodec.encode(cs);
        CrossSection some = CrossSectionCodec.decode(cs.date(), payload,
                new PanelStore.Columns(Set.of("noise_alpha", "market_cap"), Set.of("listing_tier")));
        assertEquals(Set.of("noise_alpha"), some.numbers().keySet());
        assertBits(cs.numbers().get("noise_alpha"), some.numberColumn("noise_alpha"));
        assertEquals(Set.of("listing_tier"), some.labels().keySet());
        assertArrayEquals(cs.labels().get("listing_tier"), some.labelColumn("listing_tier"));
        assertBits(cs.returns(), some.returns());
        assertBits(cs.marketCaps(), some.marketCaps());
        assertArrayEquals(cs.securityIds(), some.securityIds());
        // a column left out reads as absent: all missing
        assertTrue(Double.isNaN(some.numberColumn("book_to_price")[0]));
        CrossSection none = CrossSectionCodec.decode(cs.date(), payload, new PanelStore.Columns(Set.of(), Set.of()));
        assertTrue(none.numbers().isEmpty() && none.labels().isEmpty());
        assertBits(cs.returns(), none.returns());
    }

    private static void assertBits(double[] expected, double[] actual) {
        assertEquals(expected.length, actual.length);
        for (int i = 0; i < expected.length; i++) {
            assertEquals(Double.doubleToRawLongBits(expected[i]), Double.doubleToRawLongBits(actual[i]), "value " + i);
        }
    }
}
