package dev.winnow.research;

import dev.winnow.store.VersionStatus;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.DefineOutcome;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FamilyStore;
import dev.winnow.store.FamilyStore.DeclaredVariant;
import dev.winnow.store.FamilyStore.FamilyRecord;
import dev.winnow.store.FamilyStore.VariantRecord;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Variant families: a base definition and, per dotted path into it, the values to try. The family is the Cartesian
 * product of those values (the first listed path varying slowest); variant n (from 1) is the factor
 * {@code <family>-<n>}, and every version of every variant is a trial. A declaration that leaves a variant's
 * definition unchanged reuses its version (no new trial); variants that a later declaration drops are retired, their
 * versions remaining trials.
 */
public final class Families {
    /** Most variants in one family. */
    public static final int MAX_VARIANTS = 200;
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final Set<String> FIELDS = Set.of("base", "vary", "theme", "rationale");
    private static final Pattern SEGMENT = Pattern.compile("([A-Za-z_][A-Za-z0-9_]*)((?:\\[[0-9]+\\])*)");

    private final FamilyStore families;
    private final FactorStore factors;
    private final FactorDefinitions definitions;
    private final WorkQueue queue;
    private final TrialLibrary library;

    public Families(FamilyStore families, FactorStore factors, FactorDefinitions definitions, WorkQueue queue, TrialLibrary library) {
        this.families = families;
        this.factors = factors;
        this.definitions = definitions;
        this.queue = queue;
        this.library = library;
    }

    /** The declaration cannot be accepted; every problem is listed (with the variant it concerns). */
    public static final class InvalidFamilyException extends Exception {
        private final List<String> problems;

        public InvalidFamilyException(List<String> problems) {
            super(String.join("; ", problems));
            this.problems = List.copyOf(problems);
        }

        public List<String> problems() {
            return problems;
        }
    }

    /** What a declaration led to: the family, its number of variants, and the build job (null when nothing changed). */
    public record Declared(String family, int variants, int newVersions, Long job) {
    }

    /** One variant as declared: its number, factor name, parameter values and full definition. */
    private record Variant(int n, String factor, ObjectNode parameters, ObjectNode definition) {
    }

    public Declared declare(String name, JsonNode body) throws InvalidFamilyException {
        List<String> problems = new ArrayList<>();
        if (body == null || !body.isObject()) {
            throw new InvalidFamilyException(List.of("the family must be a JSON object with base and vary"));
        }
        for (Iterator<String> it = body.fieldNames(); it.hasNext(); ) {
            String field = it.next();
            if (!FIELDS.contains(field)) {
                problems.add("unknown field '" + field + "'; known fields are [base, rationale, theme, vary]");
            }
        }
        JsonNode base = body.get("base");
        JsonNode vary = body.get("vary");
        if (name.length() > 96) {
            problems.add("a family name may have at most 96 characters, so that its variants <family>-<n> are valid factor names");
        }
        if (base == null || !base.isObject()) {
            problems.add("base is required: a factor definition, as a factor is declared");
        }
        if (vary == null || !vary.isObject() || vary.isEmpty()) {
            problems.add("vary is required: an object mapping at least one path into the definition to a non-empty array of values");
        }
        for (String field : List.of("theme", "rationale")) {
            if (body.has(field) && !body.get(field).isTextual()) {
                problems.add(field + " must be a string");
            }
        }
        if (!problems.isEmpty()) {
            throw new InvalidFamilyException(problems);
        }
        List<String> paths = new ArrayList<>();
        List<JsonNode> values = new ArrayList<>();
        long count = 1;
        for (Iterator<Map.Entry<String, JsonNode>> it = vary.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            if (!e.getValue().isArray() || e.getValue().isEmpty()) {
                problems.add("vary." + e.getKey() + " must be a non-empty array of values");
                continue;
            }
            if (!validPath(e.getKey())) {
                problems.add("vary path '" + e.getKey() + "' is not a dotted path into the definition (as in "
                        + "signal.trailing_return.periods or signal.combine[0].weight)");
                continue;
            }
            paths.add(e.getKey());
            values.add(e.getValue());
            count *= e.getValue().size();
        }
        if (count > MAX_VARIANTS) {
            problems.add("the family has " + count + " variants; at most " + MAX_VARIANTS + " are allowed (vary fewer values)");
        }
        if (!problems.isEmpty()) {
            throw new InvalidFamilyException(problems);
        }
        List<Variant> variants = expand(name, (ObjectNode) base, body, paths, values, problems);
        if (!problems.isEmpty()) {
            throw new InvalidFamilyException(problems);
        }
        List<FactorDefinitions.Checked> checked = new ArrayList<>();
        for (Variant v : variants) {
            String label = "variant " + v.n() + " (" + describe(v.parameters()) + "): ";
            if ("external".equals(v.definition().path("method").asText())) {
                problems.add(label + "method external cannot vary: its returns are uploaded, not built");
                continue;
            }
            try {
                checked.add(definitions.check(v.factor(), v.definition()));
            } catch (FactorDefinitions.InvalidDefinitionException e) {
                e.problems().forEach(p -> problems.add(label + p));
            }
            factors.current(v.factor()).ifPresent(existing -> {
                if (!name.equals(existing.family())) {
                    problems.add(label + "factor '" + v.factor() + "' already exists outside this family; rename the family");
                }
            });
        }
        if (!problems.isEmpty()) {
            throw new InvalidFamilyException(problems);
        }
        return record(name, body, variants, checked);
    }

    private Declared record(String name, JsonNode body, List<Variant> variants, List<FactorDefinitions.Checked> checked) {
        List<WorkQueue.FactorVersion> toBuild = new ArrayList<>();
        List<DeclaredVariant> declared = new ArrayList<>();
        for (int i = 0; i < variants.size(); i++) {
            Variant v = variants.get(i);
            FactorVersionRecord current = factors.current(v.factor()).orElse(null);
            if (current != null && current.retired()) {
                factors.unretire(v.factor());
            }
            FactorVersionRecord same = sameConstruction(v.factor(), current, checked.get(i));
            if (same != null) {
                if (same.version() != current.version()) {
                    factors.makeCurrent(same.factorId(), same.version());
                }
                declared.add(new DeclaredVariant(v.n(), v.factor(), v.parameters().toString()));
                continue;
            }
            DefineOutcome outcome = definitions.record(v.factor(), checked.get(i));
            if (outcome.created()) {
                toBuild.add(new WorkQueue.FactorVersion(v.factor(), outcome.version().version()));
            }
            declared.add(new DeclaredVariant(v.n(), v.factor(), v.parameters().toString()));
        }
        FamilyRecord previous = families.find(name).orElse(null);
        if (previous != null) {
            for (VariantRecord old : families.variants(previous.id())) {
                if (old.n() > variants.size()) {
                    factors.retire(old.factorName());
                }
            }
        }
        FamilyRecord family = families.declare(name, body.toString(), declared);
        Long job = null;
        if (!toBuild.isEmpty()) {
            job = queue.queueFamilyBuild(name, toBuild);
            families.setJob(family.id(), job);
        }
        return new Declared(name, variants.size(), toBuild.size(), job);
    }

    /**
     * A built (not failed) version of the variant's factor whose construction key equals the new definition's, the
     * current one first; null when there is none, so a new version (a new trial) is needed.
     */
    private FactorVersionRecord sameConstruction(String factor, FactorVersionRecord current, FactorDefinitions.Checked checked) {
        if (current == null) {
            return null;
        }
        String key = checked.definition().constructionKey();
        List<FactorVersionRecord> candidates = new ArrayList<>();
        candidates.add(current);
        for (int k = 1; ; k++) {
            java.util.Optional<FactorVersionRecord> other = factors.version(factor, k);
            if (other.isEmpty()) {
                break;
            }
            if (k != current.version()) {
                candidates.add(other.get());
            }
        }
        for (FactorVersionRecord c : candidates) {
            if (c.status() == VersionStatus.FAILED) {
                continue;
            }
            dev.winnow.construct.DefinitionJson.Parsed parsed = dev.winnow.construct.DefinitionJson.read(c.definitionJson());
            if (parsed.ok() && parsed.definition().constructionKey().equals(key)) {
                return c;
            }
        }
        return null;
    }

    /** The Cartesian product, first path slowest; each variant's definition is the base with its values set. */
    private static List<Variant> expand(String family, ObjectNode base, JsonNode body, List<String> paths, List<JsonNode> values,
                                        List<String> problems) {
        int total = 1;
        for (JsonNode v : values) {
            total *= v.size();
        }
        List<Variant> out = new ArrayList<>();
        int[] index = new int[paths.size()];
        for (int n = 1; n <= total; n++) {
            ObjectNode definition = base.deepCopy();
            for (String field : List.of("theme", "rationale")) {
                if (body.has(field)) {
                    definition.put(field, body.get(field).asText());
                }
            }
            ObjectNode parameters = MAPPER.createObjectNode();
            for (int p = 0; p < paths.size(); p++) {
                JsonNode value = values.get(p).get(index[p]);
                parameters.set(paths.get(p), value);
                String problem = set(definition, paths.get(p), value);
                if (problem != null) {
                    problems.add("variant " + n + ": vary path '" + paths.get(p) + "': " + problem);
                }
            }
            out.add(new Variant(n, family + "-" + n, parameters, definition));
            for (int p = paths.size() - 1; p >= 0; p--) {
                if (++index[p] < values.get(p).size()) {
                    break;
                }
                index[p] = 0;
            }
        }
        return out;
    }

    private static boolean validPath(String path) {
        for (String segment : path.split("\\.", -1)) {
            if (!SEGMENT.matcher(segment).matches()) {
                return false;
            }
        }
        return true;
    }

    /**
     * Sets the value at a dotted path ({@code a.b[0].c}) in the definition, creating missing object fields; an array
     * index must exist. Returns a problem, or null when set.
     */
    static String set(ObjectNode root, String path, JsonNode value) {
        String[] segments = path.split("\\.");
        JsonNode node = root;
        StringBuilder at = new StringBuilder();
        for (int s = 0; s < segments.length; s++) {
            Matcher m = SEGMENT.matcher(segments[s]);
            if (!m.matches()) {
                return "'" + segments[s] + "' is not a field name";
            }
            String field = m.group(1);
            List<Integer> indices = new ArrayList<>();
            Matcher idx = Pattern.compile("\\[([0-9]+)\\]").matcher(m.group(2));
            while (idx.find()) {
                indices.add(Integer.parseInt(idx.group(1)));
            }
            if (!(node instanceof ObjectNode object)) {
                return "the base has no object at '" + at + "' to set field '" + field + "' in";
            }
            at.append(at.length() == 0 ? "" : ".").append(field);
            boolean last = s == segments.length - 1;
            if (last && indices.isEmpty()) {
                object.set(field, value);
                return null;
            }
            JsonNode child = object.get(field);
            if (child == null || child.isNull()) {
                if (!indices.isEmpty()) {
                    return "the base has no array at '" + at + "'";
                }
                child = object.putObject(field);
            }
            for (int k = 0; k < indices.size(); k++) {
                int i = indices.get(k);
                if (!(child instanceof ArrayNode array) || i >= array.size()) {
                    return "the base has no element [" + i + "] at '" + at + "'";
                }
                at.append('[').append(i).append(']');
                if (last && k == indices.size() - 1) {
                    array.set(i, value);
                    return null;
                }
                child = array.get(i);
            }
            node = child;
        }
        return "nothing to set";
    }

    private static String describe(ObjectNode parameters) {
        List<String> parts = new ArrayList<>();
        parameters.fields().forEachRemaining(e -> parts.add(e.getKey() + "=" + e.getValue()));
        return String.join(", ", parts);
    }

    // ------------------------------------------------------------------------------------------------------ reading
    /** One variant's row: its factor, current version, parameters, status and monthly-basis statistics. */
    public record VariantView(String factor, int version, JsonNode parameters, String status, Integer n, Double mean,
                              @JsonProperty("nw_t_stat") Double nwTStat, @JsonProperty("p_value") Double pValue,
                              @JsonProperty("sharpe_monthly") Double sharpeMonthly) {
    }

    /** The ready variant with the largest NW t and its haircuts from the library-wide trial table. */
    public record Best(String factor, @JsonProperty("nw_t_stat") double nwTStat, @JsonProperty("p_holm") double pHolm,
                       @JsonProperty("p_bh") double pBh, @JsonProperty("deflated_sharpe") double deflatedSharpe) {
    }

    /** Over the ready variants with a defined NW t-statistic. */
    public record Summary(int variants, int ready, @JsonProperty("median_nw_t") Double medianNwT,
                          @JsonProperty("min_nw_t") Double minNwT, @JsonProperty("max_nw_t") Double maxNwT,
                          @JsonProperty("positive_share") Double positiveShare,
                          @JsonProperty("significant_share") Double significantShare, Best best) {
    }

    /** @param job the latest build job's id (a string, as in every job answer), null when none was needed */
    public record View(String family, JsonNode base, JsonNode vary, String job, List<VariantView> variants, Summary summary) {
    }

    /** A family in the list. */
    public record Listed(String family, int variants, String job) {
    }

    public View get(String name) {
        FamilyRecord f = live(name);
        JsonNode spec = readJson(f.specJson());
        TrialLibrary.Snapshot snapshot = library.snapshot();
        List<VariantView> rows = new ArrayList<>();
        List<TrialLibrary.Trial> readyTrials = new ArrayList<>();
        for (VariantRecord v : families.variants(f.id())) {
            if (!v.active()) {
                continue;
            }
            FactorVersionRecord current = factors.current(v.factorName()).orElseThrow();
            TrialLibrary.Trial trial = snapshot.find(current).orElse(null);
            dev.winnow.stats.TrialStatistics s = trial == null || trial.row() == null ? null : trial.row().statistics();
            rows.add(new VariantView(v.factorName(), current.version(), readJson(v.parametersJson()), current.status().wireName(),
                    s == null ? null : s.n(), finite(s == null ? Double.NaN : s.mean()), finite(s == null ? Double.NaN : s.nwTStat()),
                    finite(s == null ? Double.NaN : s.pValue()), finite(s == null ? Double.NaN : s.sharpe())));
            if (current.status() == VersionStatus.READY && s != null && Double.isFinite(s.nwTStat())) {
                readyTrials.add(trial);
            }
        }
        int readyCount = (int) rows.stream().filter(r -> "ready".equals(r.status())).count();
        return new View(f.name(), spec.get("base"), spec.get("vary"), jobText(f.jobId()), rows,
                summary(rows.size(), readyCount, readyTrials));
    }

    /**
     * The summary over the ready variants with a defined NW t: median (mean of the middle two for an even count),
     * minimum and maximum; the shares above 0 and above 2; the best by NW t with its Holm and Benjamini-Hochberg
     * adjusted p-values and deflated Sharpe ratio from the library-wide table.
     */
    static Summary summary(int variants, int ready, List<TrialLibrary.Trial> trials) {
        if (trials.isEmpty()) {
            return new Summary(variants, ready, null, null, null, null, null, null);
        }
        double[] t = trials.stream().mapToDouble(x -> x.row().statistics().nwTStat()).toArray();
        double[] sorted = t.clone();
        Arrays.sort(sorted);
        int m = sorted.length;
        double median = m % 2 == 1 ? sorted[m / 2] : (sorted[m / 2 - 1] + sorted[m / 2]) / 2.0;
        int best = 0;
        int positive = 0;
        int significant = 0;
        for (int i = 0; i < m; i++) {
            if (t[i] > t[best]) {
                best = i;
            }
            positive += t[i] > 0 ? 1 : 0;
            significant += t[i] > 2 ? 1 : 0;
        }
        TrialLibrary.Trial b = trials.get(best);
        return new Summary(variants, ready, median, sorted[0], sorted[m - 1], positive / (double) m, significant / (double) m,
                new Best(b.name(), t[best], b.row().pHolm(), b.row().pBh(), b.row().deflatedSharpe()));
    }

    public List<Listed> list() {
        List<Listed> out = new ArrayList<>();
        for (FamilyRecord f : families.listLive()) {
            int active = (int) families.variants(f.id()).stream().filter(VariantRecord::active).count();
            out.add(new Listed(f.name(), active, jobText(f.jobId())));
        }
        return out;
    }

    /** Retires every variant of the family (their versions remain trials) and the family itself. */
    public void delete(String name) {
        FamilyRecord f = live(name);
        for (VariantRecord v : families.variants(f.id())) {
            factors.retire(v.factorName());
        }
        families.retire(name);
    }

    private FamilyRecord live(String name) {
        return families.find(name).filter(f -> !f.retired())
                .orElseThrow(() -> new UnknownNameException("No family '" + name + "'", NameKind.FAMILY));
    }

    private static String jobText(Long id) {
        return id == null ? null : String.valueOf(id);
    }

    private static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    private static JsonNode readJson(String text) {
        try {
            return MAPPER.readTree(text);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
