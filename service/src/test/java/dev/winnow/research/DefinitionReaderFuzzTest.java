package dev.winnow.research;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.DefinitionValidator;
import dev.winnow.construct.PanelSchema;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Bounded fuzz test of the JSON definition reader (issue 14): definitions built at random from the fields and values
 * the reader knows, and valid definitions mutated as text, from a fixed seed. Each is either read and validated (and
 * then written in canonical form and read back) or refused with problems; no exception escapes. This is the path of
 * {@code PUT /v1/factors/{factor}} before the store: text-length limits, {@code DefinitionJson.read},
 * {@code DefinitionValidator.validate}.
 *
 * <p>Run it longer with {@code mvn -q -B test -Dtest=DefinitionReaderFuzzTest -Dwinnow.fuzz.cases=200000
 * -Dwinnow.fuzz.seed=7} (defaults: 3,000 cases, seed 14). A failure names the seed, the case and the input.
 */
class DefinitionReaderFuzzTest {
    private static final long SEED = Long.getLong("winnow.fuzz.seed", 14);
    private static final int CASES = Integer.getInteger("winnow.fuzz.cases", 3_000);
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final PanelSchema SCHEMA = new PanelSchema(Map.of("book_to_price", PanelSchema.ColumnType.NUMBER,
            "momentum", PanelSchema.ColumnType.NUMBER, "listing_tier", PanelSchema.ColumnType.LABEL), true);

    private static final String[] VALID = {
            "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":\"book_to_price\",\"direction\":\"high_minus_low\",\"buckets\":5,"
                    + "\"weighting\":\"cap\",\"lag\":1,\"rebalance\":\"monthly\",\"cost_bps\":10,\"theme\":\"value\",\"rationale\":\"cheap\"}",
            "{\"panel\":\"acme\",\"method\":\"size_sort\",\"signal\":\"book_to_price\",\"output\":\"signal\","
                    + "\"breakpoints\":{\"column\":\"listing_tier\",\"equals\":\"main\"},\"theme\":\"value\",\"rationale\":\"x\"}",
            "{\"panel\":\"acme\",\"method\":\"market\",\"risk_free\":\"rf\",\"theme\":\"market\",\"rationale\":\"all\"}",
            "{\"method\":\"external\",\"theme\":\"rates\",\"rationale\":\"cash\"}",
            "{\"panel\":\"acme\",\"method\":\"sort\",\"signal\":{\"zscore\":{\"of\":{\"ratio\":[\"book_to_price\",\"momentum\"]}}},"
                    + "\"buckets\":3,\"theme\":\"value\"}",
    };
    private static final String[] KEYS = {"panel", "method", "signal", "direction", "buckets", "weighting", "lag",
            "rebalance", "rebalance_month", "cost_bps", "theme", "rationale", "risk_free", "output", "breakpoints",
            "universe", "column", "equals", "min_market_cap", "include", "exclude", "of", "ratio", "zscore", "rank",
            "lag", "periods", "combine", "weights", "unknown", ""};
    private static final String[] WORDS = {"acme", "sort", "size_sort", "market", "external", "book_to_price",
            "momentum", "listing_tier", "main", "cap", "equal", "monthly", "quarterly", "annual", "every_period",
            "high_minus_low", "low_minus_high", "signal", "spread", "", " ", "NaN", "\u0000", "é", "x".repeat(250)};

    @Test
    void everyDefinitionIsReadOrRefusedWithProblemsNeverAnException() throws IOException {
        SplittableRandom random = new SplittableRandom(SEED);
        for (int c = 0; c < CASES; c++) {
            String text = random.nextInt(3) == 0 ? MAPPER.writeValueAsString(tree(random, 0))
                    : mutate(random, VALID[random.nextInt(VALID.length)]);
            try {
                check(text);
            } catch (Throwable e) {
                fail("seed " + SEED + ", case " + c + ": " + e + " for input " + text, e);
            }
        }
    }

    private static void check(String text) throws IOException {
        JsonNode body;
        try {
            body = MAPPER.readTree(text);
        } catch (IOException notJson) {
            return; // the API answers 400 "not valid JSON"
        }
        if (body == null || !body.isObject()) {
            return; // the API answers 400 "must be a JSON object"
        }
        List<String> tooLong = DefinitionTextLimits.problems(body);
        if (!tooLong.isEmpty()) {
            assertProblems(tooLong);
            return;
        }
        DefinitionJson.Parsed parsed = DefinitionJson.read(body);
        if (!parsed.ok()) {
            assertProblems(parsed.problems());
            return;
        }
        assertNotNull(parsed.definition());
        List<String> problems = DefinitionValidator.validate(parsed.definition(), SCHEMA);
        if (!problems.isEmpty()) {
            assertProblems(problems);
        }
        String canonical = DefinitionJson.toCanonicalString(parsed.definition());
        DefinitionJson.Parsed again = DefinitionJson.read(canonical);
        assertTrue(again.ok(), () -> "the canonical form reads back: " + canonical + " " + again.problems());
        assertTrue(canonical.equals(DefinitionJson.toCanonicalString(again.definition())), "canonical form is stable");
    }

    private static void assertProblems(List<String> problems) {
        assertFalse(problems.isEmpty());
        for (String p : problems) {
            assertFalse(p == null || p.isBlank(), problems::toString);
        }
    }

    /** A random JSON value over the reader's own keys and words. */
    private static JsonNode tree(SplittableRandom random, int depth) {
        JsonNodeFactory f = JsonNodeFactory.instance;
        int kind = depth > 3 ? random.nextInt(5) : random.nextInt(7);
        return switch (kind) {
            case 0 -> f.textNode(WORDS[random.nextInt(WORDS.length)]);
            case 1 -> f.numberNode(random.nextInt(7) == 0 ? random.nextDouble() * 1e9 - 5e8 : random.nextInt(-3, 30));
            case 2 -> f.booleanNode(random.nextBoolean());
            case 3 -> f.nullNode();
            case 4 -> f.numberNode(random.nextBoolean() ? Double.MAX_VALUE : Long.MIN_VALUE);
            case 5 -> {
                ArrayNode a = f.arrayNode();
                for (int i = random.nextInt(4); i > 0; i--) {
                    a.add(tree(random, depth + 1));
                }
                yield a;
            }
            default -> {
                ObjectNode o = f.objectNode();
                for (int i = random.nextInt(8); i > 0; i--) {
                    o.set(KEYS[random.nextInt(KEYS.length)], tree(random, depth + 1));
                }
                yield o;
            }
        };
    }

    /** A few byte-level edits of valid JSON text. */
    private static String mutate(SplittableRandom random, String json) {
        byte[] b = json.getBytes(StandardCharsets.UTF_8);
        StringBuilder s = new StringBuilder(new String(b, StandardCharsets.UTF_8));
        for (int m = 1 + random.nextInt(4); m > 0; m--) {
            int at = s.length() == 0 ? 0 : random.nextInt(s.length());
            switch (random.nextInt(4)) {
                case 0 -> s.insert(at, "{}[]\",:0-1e9ntf\\".charAt(random.nextInt(16)));
                case 1 -> {
                    if (s.length() > 0) {
                        s.deleteCharAt(at);
                    }
                }
                case 2 -> s.insert(at, WORDS[random.nextInt(WORDS.length)]);
                default -> {
                    int end = Math.min(s.length(), at + random.nextInt(10));
                    s.replace(at, end, String.valueOf(random.nextInt(1000)));
                }
            }
        }
        return s.toString();
    }
}
