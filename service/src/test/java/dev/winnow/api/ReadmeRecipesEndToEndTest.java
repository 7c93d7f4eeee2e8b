package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.zip.GZIPInputStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The README's recipes run: the demo scenario is loaded on a temporary store, every curl command of every shell block
 * of README.md is run by bash and curl (in order, with {@code $W}, {@code $T} and {@code $H} set, in a directory
 * holding the files the recipes upload), and an answer of 400 or more fails unless the recipe's comment names that
 * status. A 202 answer's job is awaited before the next command, so later recipes see what earlier ones built.
 * Expectations for recipe writers are in DEVELOPERS.md ("README recipes run").
 */
class ReadmeRecipesEndToEndTest {
    private static final Path README = Path.of("../README.md");
    private static final Path SEED = Path.of("../seed-data");
    private static final Pattern BLOCK = Pattern.compile("```sh\\n(.*?)```", Pattern.DOTALL);
    private static final Pattern STATUS = Pattern.compile("\\b([1-5]\\d\\d)\\b");
    private static final ObjectMapper JSON = new ObjectMapper();

    /** One curl command of a recipe: its text (continuations and quoted line breaks included) and the statuses its comment names. */
    record Command(String text, Set<Integer> expected) {
    }

    static List<Command> commands(String markdown) {
        List<Command> out = new ArrayList<>();
        Matcher block = BLOCK.matcher(markdown);
        while (block.find()) {
            String[] lines = block.group(1).split("\n", -1);
            int i = 0;
            while (i < lines.length) {
                String line = lines[i];
                if (!startsCurl(line)) {
                    i++;
                    continue;
                }
                StringBuilder text = new StringBuilder(line);
                Set<Integer> expected = new LinkedHashSet<>();
                collect(comment(line), expected);
                while ((text.toString().endsWith("\\") || unbalancedQuotes(text)) && i + 1 < lines.length) {
                    i++;
                    text.append('\n').append(lines[i]);
                    collect(comment(lines[i]), expected);
                }
                i++;
                while (i < lines.length && lines[i].trim().startsWith("#")) {
                    collect(lines[i], expected);
                    i++;
                }
                out.add(new Command(text.toString(), expected));
            }
        }
        return out;
    }

    private static boolean startsCurl(String line) {
        String t = line.trim();
        return t.startsWith("curl ") || t.contains("| curl ");
    }

    private static boolean unbalancedQuotes(CharSequence text) {
        int singles = 0;
        for (int i = 0; i < text.length(); i++) {
            if (text.charAt(i) == '\'') {
                singles++;
            }
        }
        return singles % 2 == 1;
    }

    /** The trailing comment of a line: after a '#' preceded by whitespace and outside single quotes. */
    private static String comment(String line) {
        boolean quoted = false;
        for (int i = 0; i < line.length(); i++) {
            char c = line.charAt(i);
            if (c == '\'') {
                quoted = !quoted;
            } else if (c == '#' && !quoted && (i == 0 || Character.isWhitespace(line.charAt(i - 1)))) {
                return line.substring(i);
            }
        }
        return "";
    }

    private static void collect(String comment, Set<Integer> into) {
        Matcher m = STATUS.matcher(comment);
        while (m.find()) {
            into.add(Integer.parseInt(m.group(1)));
        }
    }

    @Test
    void commandsAreFoundWithContinuationsQuotesAndExpectations() {
        String md = """
                ```sh
                W=http://x      # not a command
                curl -H "$H" $W/a                # 404 when absent
                curl -X PUT $W/b -d '{
                  "a": 1}'
                                                 # 202 {"job"}
                gzip -c f.csv | curl -H 'x' \\
                     --data-binary @- $W/c
                ```
                text
                ```sh
                curl $W/d
                ```
                """;
        List<Command> got = commands(md);
        assertEquals(4, got.size(), got.toString());
        assertEquals(Set.of(404), got.get(0).expected());
        assertTrue(got.get(1).text().endsWith("\"a\": 1}'"), got.get(1).text());
        assertEquals(Set.of(202), got.get(1).expected());
        assertTrue(got.get(2).text().contains("--data-binary"), got.get(2).text());
        assertEquals(Set.of(), got.get(3).expected());
    }

    @Test
    void everyCurlRecipeOfTheReadmeRunsAgainstTheDemo() throws Exception {
        List<Command> commands = commands(Files.readString(README, StandardCharsets.UTF_8));
        assertTrue(commands.size() > 30, "found only " + commands.size() + " curl commands in README.md");
        try (TestServer server = new TestServer()) {
            assertTrue(!server.winnow().loadDemoIfEmpty().isEmpty(), "the demo loads into the empty store");
            Path dir = Files.createTempDirectory(server.dataDir(), "recipes");
            writeFiles(dir);
            String base = "http://127.0.0.1:" + server.winnow().port();
            List<String> failures = new ArrayList<>();
            for (int n = 0; n < commands.size(); n++) {
                Command c = commands.get(n);
                Path body = dir.resolve("answer-" + n);
                Path code = dir.resolve("status-" + n);
                String script = "W=" + base + "\nT=" + TestServer.ADMIN + "\nH=\"Authorization: Bearer $T\"\n"
                        + "curl() { command curl -sS -o '" + body + "' -w '%{http_code}' \"$@\" > '" + code + "'; }\n"
                        + c.text() + "\n";
                Process p = new ProcessBuilder("bash", "-c", script).directory(dir.toFile()).redirectErrorStream(true)
                        .redirectOutput(dir.resolve("log-" + n).toFile()).start();
                if (!p.waitFor(120, TimeUnit.SECONDS)) {
                    p.destroyForcibly();
                    failures.add(c.text() + "\n    did not finish");
                    continue;
                }
                String status = Files.exists(code) ? Files.readString(code).trim() : "";
                if (!status.matches("\\d{3}") || status.equals("000")) {
                    failures.add(c.text() + "\n    curl did not get an answer: " + Files.readString(dir.resolve("log-" + n)));
                    continue;
                }
                int s = Integer.parseInt(status);
                String answer = Files.exists(body) ? Files.readString(body) : "";
                if (s >= 400 && !c.expected().contains(s)) {
                    failures.add(c.text() + "\n    answered " + s + ": " + answer);
                }
                if (s == 202) {
                    JsonNode job = JSON.readTree(answer).path("job");
                    if (job.isTextual()) {
                        server.awaitJob(job.asText());
                    }
                }
            }
            assertEquals(List.of(), failures, "README recipes that answer an error they do not say to expect");
        }
    }

    /**
     * The files the recipes upload: {@code prices.csv} (the demo panel's next month, its last month's rows moved on
     * a month), {@code fix.csv} (a revision of that month) and {@code rates.csv} (a monthly series).
     */
    private static void writeFiles(Path dir) throws IOException {
        List<String> lines;
        try (GZIPInputStream in = new GZIPInputStream(Files.newInputStream(SEED.resolve("demo-market.csv.gz")))) {
            lines = new String(in.readAllBytes(), StandardCharsets.UTF_8).lines().toList();
        }
        String header = lines.get(0);
        List<String> last = lines.stream().filter(l -> l.startsWith("2024-12-31,")).toList();
        StringBuilder prices = new StringBuilder(header).append('\n');
        StringBuilder fix = new StringBuilder(header).append('\n');
        for (String row : last) {
            prices.append("2025-01-31").append(row.substring(10)).append('\n');
        }
        for (String row : last.subList(0, Math.min(50, last.size()))) {
            fix.append("2025-01-31").append(row.substring(10)).append('\n');
        }
        Files.writeString(dir.resolve("prices.csv"), prices);
        Files.writeString(dir.resolve("fix.csv"), fix);
        StringBuilder rates = new StringBuilder("date,return\n");
        for (String row : lines.subList(1, lines.size())) {
            if (row.contains(",QX0001,")) {
                rates.append(row, 0, 10).append(",0.002\n");
            }
        }
        Files.writeString(dir.resolve("rates.csv"), rates);
    }
}
