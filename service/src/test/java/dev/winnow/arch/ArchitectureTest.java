package dev.winnow.arch;

import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The house rules, read from the main sources (surefire runs in service/): which project packages each package may
 * refer to (imports and fully qualified names alike), as DEVELOPERS.md's table lists them. In particular {@code stats}
 * refers to nothing of the project, {@code construct} never to {@code store}, and nothing but {@code api} and
 * {@code app} imports Javalin. A new package must be added here and to DEVELOPERS.md.
 */
class ArchitectureTest {
    private static final Path MAIN = Path.of("src/main/java/dev/winnow");
    private static final Pattern PROJECT_REFERENCE = Pattern.compile("\\bdev\\.winnow\\.([a-z]+)\\b");
    private static final Pattern JAVALIN = Pattern.compile("^import\\s+(static\\s+)?io\\.javalin\\.", Pattern.MULTILINE);

    /** Top-level package to the project packages it may refer to. */
    private static final Map<String, Set<String>> ALLOWED = Map.of(
            "app", Set.of("api", "jobs", "research", "ingest", "store", "construct", "stats", "charts"),
            "api", Set.of("jobs", "research", "ingest", "store", "construct", "stats", "charts"),
            "jobs", Set.of("research", "ingest", "store", "construct", "stats"),
            "research", Set.of("store", "construct", "stats"),
            "ingest", Set.of("store", "construct", "stats"),
            "store", Set.of("construct", "stats"),
            "construct", Set.of("stats"),
            "charts", Set.of(),
            "stats", Set.of());

    private static final Set<String> MAY_IMPORT_JAVALIN = Set.of("api", "app");

    record Source(String topPackage, Path file, String text) {
    }

    private static List<Source> sources() throws IOException {
        List<Source> out = new ArrayList<>();
        try (Stream<Path> files = Files.walk(MAIN)) {
            for (Path f : files.filter(p -> p.toString().endsWith(".java")).toList()) {
                String top = MAIN.relativize(f).getName(0).toString();
                out.add(new Source(top, f, Files.readString(f, StandardCharsets.UTF_8)));
            }
        }
        assertTrue(out.size() > 100, "found only " + out.size() + " sources under " + MAIN.toAbsolutePath());
        return out;
    }

    /** The project packages a source refers to, outside its own package line. */
    static Set<String> references(String text) {
        Set<String> out = new TreeSet<>();
        for (String line : text.split("\\R")) {
            if (line.startsWith("package ")) {
                continue;
            }
            Matcher m = PROJECT_REFERENCE.matcher(line);
            while (m.find()) {
                out.add(m.group(1));
            }
        }
        return out;
    }

    @Test
    void everyPackageRefersOnlyToThePackagesBelowIt() throws IOException {
        List<String> violations = new ArrayList<>();
        for (Source s : sources()) {
            Set<String> allowed = ALLOWED.get(s.topPackage());
            if (allowed == null) {
                violations.add(s.file() + ": package '" + s.topPackage() + "' is not in ArchitectureTest.ALLOWED nor in DEVELOPERS.md");
                continue;
            }
            for (String ref : references(s.text())) {
                if (!ref.equals(s.topPackage()) && !allowed.contains(ref)) {
                    violations.add(s.file() + ": " + s.topPackage() + " refers to " + ref);
                }
            }
        }
        assertEquals(List.of(), violations);
    }

    /** The rows of DEVELOPERS.md's architecture table: package, then the packages of each further column. */
    static Map<String, List<Set<String>>> documentedTable(String markdown) {
        int start = markdown.indexOf("<!-- architecture-table");
        int end = markdown.indexOf("<!-- end architecture-table -->");
        assertTrue(start >= 0 && end > start, "DEVELOPERS.md has no architecture table between its markers");
        Map<String, List<Set<String>>> rows = new java.util.TreeMap<>();
        Pattern name = Pattern.compile("`([a-z]+)`");
        for (String line : markdown.substring(start, end).split("\\R")) {
            String[] cells = line.split("\\|");
            if (cells.length < 4 || !cells[1].trim().startsWith("`")) {
                continue;
            }
            List<Set<String>> columns = new ArrayList<>();
            for (int c = 2; c < cells.length; c++) {
                Set<String> packages = new TreeSet<>();
                Matcher m = name.matcher(cells[c]);
                while (m.find()) {
                    packages.add(m.group(1));
                }
                columns.add(packages);
            }
            rows.put(cells[1].trim().replace("`", ""), columns);
        }
        return rows;
    }

    /**
     * DEVELOPERS.md's table says what each package refers to today (exactly what the sources refer to, so the
     * diagram's description stays true) and what it may refer to (exactly {@link #ALLOWED}).
     */
    @Test
    void developersTableIsTheRealDependencies() throws IOException {
        Map<String, List<Set<String>>> table = documentedTable(Files.readString(Path.of("../DEVELOPERS.md"), StandardCharsets.UTF_8));
        Map<String, Set<String>> actual = new java.util.TreeMap<>();
        ALLOWED.keySet().forEach(p -> actual.put(p, new TreeSet<>()));
        for (Source s : sources()) {
            for (String ref : references(s.text())) {
                if (!ref.equals(s.topPackage())) {
                    actual.computeIfAbsent(s.topPackage(), k -> new TreeSet<>()).add(ref);
                }
            }
        }
        assertEquals(new TreeSet<>(ALLOWED.keySet()), table.keySet(), "the packages of DEVELOPERS.md's table");
        List<String> wrong = new ArrayList<>();
        for (String p : ALLOWED.keySet()) {
            if (!table.get(p).get(0).equals(actual.get(p))) {
                wrong.add(p + " refers to " + actual.get(p) + ", the table says " + table.get(p).get(0));
            }
            if (!table.get(p).get(1).equals(new TreeSet<>(ALLOWED.get(p)))) {
                wrong.add(p + " may refer to " + new TreeSet<>(ALLOWED.get(p)) + ", the table says " + table.get(p).get(1));
            }
        }
        assertEquals(List.of(), wrong, "DEVELOPERS.md's architecture table against the sources");
    }

    @Test
    void nothingBelowApiImportsJavalin() throws IOException {
        List<String> violations = new ArrayList<>();
        for (Source s : sources()) {
            if (!MAY_IMPORT_JAVALIN.contains(s.topPackage()) && JAVALIN.matcher(s.text()).find()) {
                violations.add(s.file().toString());
            }
        }
        assertEquals(List.of(), violations, "sources below api that import Javalin");
    }

    @Test
    void statsRefersToNothingOfTheProjectAndConstructNeverToStore() {
        assertTrue(ALLOWED.get("stats").isEmpty());
        assertTrue(!ALLOWED.get("construct").contains("store"));
    }

    @Test
    void referencesAreFoundInImportsAndQualifiedNames() {
        String text = """
                package dev.winnow.stats;

                import dev.winnow.store.FactorStore;
                import static dev.winnow.api.Json.respond;
                class X { Object y = dev.winnow.construct.FactorEngine.class; }
                """;
        assertEquals(Set.of("store", "api", "construct"), references(text));
    }
}
