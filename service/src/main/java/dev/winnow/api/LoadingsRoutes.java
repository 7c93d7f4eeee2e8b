package dev.winnow.api;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.StreamWriteFeature;
import com.fasterxml.jackson.core.io.NumberOutput;
import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.construct.CharacteristicExposures;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.FactorGrid;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.PortfolioExposure;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.construct.SecurityLoadingsHistory;
import dev.winnow.ingest.JobQueue;
import dev.winnow.ingest.LoadingsJobs;
import dev.winnow.stats.Frequency;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsStore.LoadingsConfig;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import dev.winnow.store.StorePanelSource;
import io.javalin.http.Context;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.time.LocalDate;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.NoSuchElementException;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Security loadings for the risk system: regression loadings of securities on factor returns (served from the store
 * when the panel's loadings config matches and the date is stored, else computed on the fly), characteristic
 * exposures, portfolio exposures, the per-panel loadings config and its history job.
 */
public final class LoadingsRoutes {
    private static final int MAX_WINDOW = 100_000;
    private static final String SOURCE_HEADER = "Winnow-Loadings-Source";
    /** Shortest round-trip decimals by the Schubfach algorithm: several times faster than Double.toString on Java 17. */
    private static final JsonFactory FAST_NUMBERS = JsonFactory.builder().enable(StreamWriteFeature.USE_FAST_DOUBLE_WRITER).build();

    private final PanelStore panels;
    private final FactorStore factors;
    private final LoadingsStore loadings;
    private final JobQueue queue;
    private final Map<Long, SecurityCodes> codeCache = new ConcurrentHashMap<>();

    public LoadingsRoutes(PanelStore panels, FactorStore factors, LoadingsStore loadings, JobQueue queue) {
        this.panels = panels;
        this.factors = factors;
        this.loadings = loadings;
        this.queue = queue;
    }

    /**
     * A panel's security codes as of one data version (new codes only become visible with an upload's commit, which
     * moves the data version), with each id's rank in code order for sorting answers.
     */
    private record SecurityCodes(long dataVersion, Map<Integer, String> byId, Map<String, Integer> byCode, int[] rankById) {
        static SecurityCodes of(long dataVersion, Map<Integer, String> byId) {
            Map<String, Integer> byCode = new HashMap<>();
            byId.forEach((id, code) -> byCode.put(code, id));
            List<Integer> ids = new ArrayList<>(byId.keySet());
            ids.sort(Comparator.comparing(byId::get));
            int[] rank = new int[ids.stream().mapToInt(Integer::intValue).max().orElse(0) + 1];
            for (int r = 0; r < ids.size(); r++) {
                rank[ids.get(r)] = r;
            }
            return new SecurityCodes(dataVersion, byId, byCode, rank);
        }

        /** Row indices of a table's securities, ordered by security code. */
        List<Integer> rowsByCode(int[] securityIds) {
            List<Integer> rows = new ArrayList<>(securityIds.length);
            for (int i = 0; i < securityIds.length; i++) {
                rows.add(i);
            }
            rows.sort(Comparator.comparingInt(i -> securityIds[i] < rankById.length ? rankById[securityIds[i]] : Integer.MAX_VALUE));
            return rows;
        }
    }

    private SecurityCodes codes(PanelRecord panel) {
        SecurityCodes cached = codeCache.get(panel.id());
        if (cached != null && cached.dataVersion() == panel.dataVersion()) {
            return cached;
        }
        SecurityCodes fresh = SecurityCodes.of(panel.dataVersion(), panels.securityCodes(panel.id()));
        codeCache.put(panel.id(), fresh);
        return fresh;
    }

    /** The factors and settings of one request, resolved to current factor versions. */
    private record Regression(LoadingsSpec spec, List<FactorVersionRecord> versions) {
        String fingerprint() {
            return LoadingsStore.fingerprint(spec, versions);
        }
    }

    /** {@code GET /v1/loadings}: regression loadings (default) or, with kind=characteristic, characteristic exposures. */
    public void get(Context ctx) {
        PanelRecord panel = panelFromQuery(ctx);
        String kind = Requests.choiceParam(ctx, "kind", List.of("regression", "characteristic"), "regression");
        LocalDate date = Requests.dateParam(ctx, "date");
        boolean csv = Responses.wantsCsv(ctx);
        if (kind.equals("characteristic")) {
            rejectParams(ctx, "kind=characteristic", "factors", "window", "min_obs");
            characteristic(ctx, panel, date != null ? date : panel.lastDate(), csv);
            return;
        }
        rejectParams(ctx, "regression loadings", "columns");
        Regression regression = regression(panel, Requests.listParam(ctx, "factors"),
                Requests.intParam(ctx, "window", 1, MAX_WINDOW), Requests.intParam(ctx, "min_obs", 1, MAX_WINDOW));
        LocalDate asOf = date != null ? date : panel.lastDate();
        LoadingsTable table = loadingsAt(ctx, panel, asOf, regression);
        SecurityCodes codes = codes(panel);
        List<Integer> rows = codes.rowsByCode(table.securityIds());
        if (csv) {
            respondCsv(ctx, loadingsCsv(table, rows, codes.byId(), regression.spec().factors()));
        } else {
            ctx.status(200).contentType("application/json").result(loadingsJson(panel, asOf, regression.spec(), table, rows, codes.byId()));
        }
    }

    /**
     * The loadings answer written field by field (a few thousand securities answer in milliseconds this way);
     * non-finite numbers are written as null, as {@link Json} does.
     */
    private static byte[] loadingsJson(PanelRecord panel, LocalDate asOf, LoadingsSpec spec, LoadingsTable table,
                                       List<Integer> rows, Map<Integer, String> codes) {
        ByteArrayOutputStream out = new ByteArrayOutputStream(256 + rows.size() * (120 + 24 * spec.factorCount()));
        try (JsonGenerator g = FAST_NUMBERS.createGenerator(out)) {
            g.writeStartObject();
            g.writeStringField("panel", panel.name());
            g.writeStringField("date", asOf.toString());
            g.writeArrayFieldStart("factors");
            for (String f : spec.factors()) {
                g.writeString(f);
            }
            g.writeEndArray();
            g.writeNumberField("window", spec.window());
            g.writeNumberField("min_obs", spec.minObs());
            g.writeArrayFieldStart("securities");
            for (int row : rows) {
                g.writeStartObject();
                g.writeStringField("security", codes.get(table.securityIds()[row]));
                g.writeNumberField("n", table.usable()[row]);
                g.writeFieldName("alpha");
                writeNumber(g, table.alpha()[row]);
                g.writeArrayFieldStart("betas");
                for (double[] column : table.betas()) {
                    writeNumber(g, column[row]);
                }
                g.writeEndArray();
                g.writeFieldName("r_squared");
                writeNumber(g, table.rSquared()[row]);
                g.writeFieldName("residual_vol");
                writeNumber(g, table.residualVol()[row]);
                g.writeStringField("reason", table.reason(row));
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        } catch (IOException e) {
            throw new UncheckedIOException("loadings could not be written as JSON", e);
        }
        return out.toByteArray();
    }

    private static void writeNumber(JsonGenerator g, double v) throws IOException {
        if (Double.isFinite(v)) {
            g.writeNumber(v);
        } else {
            g.writeNull();
        }
    }

    /** {@code GET /v1/loadings/{security}}: one security's loadings at every grid date in range where it has a row. */
    public void securityHistory(Context ctx) {
        PanelRecord panel = panelFromQuery(ctx);
        String code = ctx.pathParam("security");
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Regression regression = regression(panel, Requests.listParam(ctx, "factors"),
                Requests.intParam(ctx, "window", 1, MAX_WINDOW), Requests.intParam(ctx, "min_obs", 1, MAX_WINDOW));
        int securityId = codes(panel).byCode().getOrDefault(code, -1);
        if (securityId < 0) {
            throw ApiProblem.notFound("Panel '" + panel.name() + "' has no security '" + code + "'.");
        }
        StorePanelSource source = new StorePanelSource(panels, panel.id());
        List<LocalDate> grid = source.dates();
        int fromIndex = from == null ? 0 : insertionPoint(grid, from);
        int toIndex = to == null ? grid.size() - 1 : insertionPoint(grid, to.plusDays(1)) - 1;
        LoadingsSpec spec = regression.spec();
        SecurityLoadingsHistory history = fromIndex > toIndex ? null : SecurityLoadings.history(source,
                FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), grid), securityId,
                fromIndex, toIndex, spec.window(), spec.minObs());
        Map<String, Object> out = head(panel, "security", code, spec);
        out.put("dates", history == null ? List.of() : history.dates());
        out.put("n", history == null ? new int[0] : history.usable());
        out.put("alpha", history == null ? new double[0] : history.alpha());
        out.put("betas", history == null ? emptyColumns(spec.factorCount()) : history.betas());
        out.put("r_squared", history == null ? new double[0] : history.rSquared());
        out.put("residual_vol", history == null ? new double[0] : history.residualVol());
        Json.respond(ctx, out);
    }

    /** {@code POST /v1/exposures}: a portfolio's exposures to the factors from its holdings' loadings. */
    public void exposures(Context ctx) {
        JsonNode body = Json.readObject(ctx);
        Requests.allowOnly(body, Set.of("panel", "date", "factors", "holdings", "window", "min_obs"));
        PanelRecord panel = visiblePanel(Requests.requiredText(body, "panel"));
        LocalDate date = optionalDate(body, "date");
        JsonNode holdings = body.get("holdings");
        if (holdings == null || !holdings.isArray() || holdings.isEmpty()) {
            throw ApiProblem.badRequest("Field 'holdings' must be a non-empty array of {\"security\": code, \"weight\": number}.");
        }
        Map<String, Integer> ids = codes(panel).byCode();
        List<String> codes = new ArrayList<>();
        int[] securityIds = new int[holdings.size()];
        double[] weights = new double[holdings.size()];
        Set<String> seen = new HashSet<>();
        for (int h = 0; h < holdings.size(); h++) {
            JsonNode holding = holdings.get(h);
            String where = "holdings[" + h + "]";
            if (!holding.isObject()) {
                throw ApiProblem.badRequest(where + " must be an object {\"security\": code, \"weight\": number}.");
            }
            Requests.allowOnly(holding, Set.of("security", "weight"));
            String code = Requests.requiredText(holding, "security");
            JsonNode weight = holding.get("weight");
            if (weight == null || !weight.isNumber() || !Double.isFinite(weight.asDouble())) {
                throw ApiProblem.badRequest(where + ".weight must be a finite number.");
            }
            if (!seen.add(code)) {
                throw ApiProblem.badRequest("Security '" + code + "' is held twice; give each security one holding.");
            }
            codes.add(code);
            securityIds[h] = ids.getOrDefault(code, -1);
            weights[h] = weight.asDouble();
        }
        Regression regression = regression(panel, optionalNames(body, "factors"),
                optionalInt(body, "window"), optionalInt(body, "min_obs"));
        LocalDate asOf = date != null ? date : panel.lastDate();
        PortfolioExposure exposure = PortfolioExposure.of(loadingsAt(ctx, panel, asOf, regression), securityIds, weights);
        Map<String, Object> out = head(panel, "date", asOf, regression.spec());
        out.put("exposures", exposure.exposures());
        out.put("coverage", exposure.coverage());
        out.put("missing", exposure.missingHoldings().stream().map(codes::get).toList());
        Json.respond(ctx, out);
    }

    /** {@code PUT /v1/panels/{panel}/loadings-config}: sets the panel's default factor set (write scope). */
    public void putConfig(Context ctx) {
        PanelRecord panel = visiblePanel(ctx.pathParam("panel"));
        JsonNode body = Json.readObject(ctx);
        Requests.allowOnly(body, Set.of("factors", "window", "min_obs"));
        List<String> names = optionalNames(body, "factors");
        if (names == null) {
            throw ApiProblem.badRequest("Field 'factors' is required: an array of factor names, in regression order.");
        }
        Regression regression = regression(panel, names, optionalInt(body, "window"), optionalInt(body, "min_obs"));
        Json.respond(ctx, configView(panel, loadings.saveConfig(panel.id(), regression.spec())));
    }

    /** {@code GET /v1/panels/{panel}/loadings-config}. */
    public void getConfig(Context ctx) {
        PanelRecord panel = visiblePanel(ctx.pathParam("panel"));
        Json.respond(ctx, configView(panel, requireConfig(panel)));
    }

    /** {@code POST /v1/panels/{panel}/loadings-config/history}: 202 with the job computing every date's loadings. */
    public void history(Context ctx) {
        PanelRecord panel = visiblePanel(ctx.pathParam("panel"));
        requireConfig(panel);
        Accepted.job(ctx, queue.enqueue(LoadingsJobs.KIND, LoadingsJobs.params(panel.name(), panel.id())));
    }

    private LoadingsConfig requireConfig(PanelRecord panel) {
        return loadings.config(panel.id()).orElseThrow(() -> ApiProblem.notFound("Panel '" + panel.name()
                + "' has no loadings config; PUT /v1/panels/" + panel.name() + "/loadings-config with {\"factors\": [...]} first."));
    }

    private static Map<String, Object> configView(PanelRecord panel, LoadingsConfig config) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", panel.name());
        out.put("factors", config.spec().factors());
        out.put("window", config.spec().window());
        out.put("min_obs", config.spec().minObs());
        out.put("updated_at", config.updatedAt());
        return out;
    }

    private void characteristic(Context ctx, PanelRecord panel, LocalDate date, boolean csv) {
        List<String> columns = Requests.listParam(ctx, "columns");
        if (columns == null || columns.isEmpty()) {
            throw ApiProblem.badRequest("Query parameter 'columns' is required with kind=characteristic: numeric columns, comma-separated.");
        }
        Map<String, String> types = new LinkedHashMap<>();
        types.put("return", "number");
        types.put("market_cap", "number");
        types.putAll(panels.columns(panel.id()));
        Set<String> seen = new HashSet<>();
        for (String c : columns) {
            String type = types.get(c);
            if (type == null) {
                throw ApiProblem.badRequest("Panel '" + panel.name() + "' has no column '" + c + "'; its numeric columns are "
                        + numericColumns(types) + ".");
            }
            if (!type.equals("number")) {
                throw ApiProblem.badRequest("Column '" + c + "' holds labels; exposures need numeric columns: " + numericColumns(types) + ".");
            }
            if (!seen.add(c)) {
                throw ApiProblem.badRequest("Column '" + c + "' is listed twice.");
            }
        }
        List<LocalDate> grid = panels.dates(panel.id());
        CrossSection cs = panels.slice(panel.id(), grid.get(gridIndex(grid, date, panel.name())));
        double[][] scores = CharacteristicExposures.zScores(cs, columns);
        SecurityCodes securityCodes = codes(panel);
        Map<Integer, String> codes = securityCodes.byId();
        List<Integer> rows = securityCodes.rowsByCode(cs.securityIds());
        if (csv) {
            StringBuilder out = new StringBuilder("security");
            columns.forEach(c -> out.append(',').append(csvText(c)));
            out.append('\n');
            for (int row : rows) {
                out.append(csvText(codes.get(cs.securityIds()[row])));
                for (double[] column : scores) {
                    out.append(',').append(csvNumber(column[row]));
                }
                out.append('\n');
            }
            respondCsv(ctx, out.toString());
            return;
        }
        List<Map<String, Object>> securities = new ArrayList<>(rows.size());
        for (int row : rows) {
            double[] exposures = new double[scores.length];
            for (int c = 0; c < scores.length; c++) {
                exposures[c] = scores[c][row];
            }
            Map<String, Object> s = new LinkedHashMap<>();
            s.put("security", codes.get(cs.securityIds()[row]));
            s.put("exposures", exposures);
            securities.add(s);
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", panel.name());
        out.put("date", date);
        out.put("kind", "characteristic");
        out.put("columns", columns);
        out.put("securities", securities);
        Json.respond(ctx, out);
    }

    private static List<String> numericColumns(Map<String, String> types) {
        return types.entrySet().stream().filter(e -> e.getValue().equals("number")).map(Map.Entry::getKey).toList();
    }

    /** Stored loadings when the store has them for these inputs, else computed now; says which in a header. */
    private LoadingsTable loadingsAt(Context ctx, PanelRecord panel, LocalDate asOf, Regression regression) {
        Optional<LoadingsTable> stored = loadings.read(panel.id(), asOf, regression.fingerprint());
        ctx.header(SOURCE_HEADER, stored.isPresent() ? "stored" : "computed");
        return stored.orElseGet(() -> compute(panel, asOf, regression));
    }

    /** The fields every regression answer starts with. */
    private static Map<String, Object> head(PanelRecord panel, String key, Object value, LoadingsSpec spec) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", panel.name());
        out.put(key, value);
        out.put("factors", spec.factors());
        out.put("window", spec.window());
        out.put("min_obs", spec.minObs());
        return out;
    }

    /** Loadings computed now from the panel's slices and the factors' current series. */
    private LoadingsTable compute(PanelRecord panel, LocalDate date, Regression regression) {
        StorePanelSource source = new StorePanelSource(panels, panel.id());
        int index = gridIndex(source.dates(), date, panel.name());
        FactorGrid grid = FactorGrid.align(LoadingsFactors.series(factors, regression.versions()), source.dates());
        return SecurityLoadings.at(source, grid, index, regression.spec().window(), regression.spec().minObs());
    }

    /**
     * Factors and settings of a request. Without factors, the panel's config supplies them (and its window and
     * min_obs unless given); with factors, window and min_obs default by the panel's frequency.
     */
    private Regression regression(PanelRecord panel, List<String> names, Integer window, Integer minObs) {
        Frequency frequency = Optional.ofNullable(Frequency.fromWireName(panel.frequency())).orElse(Frequency.DAILY);
        LoadingsSpec spec;
        try {
            if (names == null) {
                LoadingsConfig config = loadings.config(panel.id()).orElseThrow(() -> ApiProblem.badRequest(
                        "Query parameter 'factors' is required: panel '" + panel.name() + "' has no loadings config to take them from."));
                LoadingsSpec configured = config.spec();
                int w = window != null ? window : configured.window();
                int m = minObs != null ? minObs
                        : window != null ? LoadingsSpec.defaultMinObs(w, configured.factorCount()) : configured.minObs();
                spec = new LoadingsSpec(configured.factors(), w, m);
            } else {
                spec = LoadingsSpec.withDefaults(names, window, minObs, frequency);
            }
        } catch (IllegalArgumentException e) {
            throw ApiProblem.badRequest("Loadings settings: " + e.getMessage() + ".");
        }
        if (spec.window() > panel.dateCount()) {
            throw ApiProblem.badRequest("Window " + spec.window() + (window == null ? " (the default for " + frequency.wireName()
                    + " panels)" : "") + " is larger than the " + panel.dateCount() + " dates of panel '" + panel.name()
                    + "'; pass window=" + panel.dateCount() + " or less.");
        }
        try {
            return new Regression(spec, LoadingsFactors.currentVersions(factors, spec.factors()));
        } catch (NoSuchElementException e) {
            throw ApiProblem.notFound(e.getMessage());
        } catch (IllegalStateException e) {
            throw ApiProblem.badRequest(e.getMessage());
        }
    }

    private PanelRecord panelFromQuery(Context ctx) {
        String name = ctx.queryParam("panel");
        if (name == null || name.isBlank()) {
            throw ApiProblem.badRequest("Query parameter 'panel' is required; GET /v1/panels lists the panels.");
        }
        return visiblePanel(name.trim());
    }

    private PanelRecord visiblePanel(String name) {
        Names.check("Panel", name);
        return panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.notFound("No panel '" + name + "'; GET /v1/panels lists them."));
    }

    /** Index of a grid date, or a 400 naming the nearest grid dates. */
    private static int gridIndex(List<LocalDate> grid, LocalDate date, String panelName) {
        int i = Collections.binarySearch(grid, date);
        if (i >= 0) {
            return i;
        }
        int next = -i - 1;
        String nearest;
        if (grid.isEmpty()) {
            nearest = "the panel has no dates";
        } else if (next == 0) {
            nearest = "it precedes the first date " + grid.get(0);
        } else if (next == grid.size()) {
            nearest = "it follows the last date " + grid.get(grid.size() - 1);
        } else {
            nearest = "the nearest dates are " + grid.get(next - 1) + " and " + grid.get(next);
        }
        throw ApiProblem.badRequest("Date " + date + " is not a date of panel '" + panelName + "': " + nearest + ".");
    }

    private static int insertionPoint(List<LocalDate> grid, LocalDate date) {
        int i = Collections.binarySearch(grid, date);
        return i >= 0 ? i : -i - 1;
    }

    private static double[][] emptyColumns(int k) {
        return new double[k][0];
    }

    private static void rejectParams(Context ctx, String what, String... names) {
        for (String name : names) {
            if (ctx.queryParam(name) != null) {
                throw ApiProblem.badRequest("Query parameter '" + name + "' does not apply to " + what + "; leave it out.");
            }
        }
    }

    private static String loadingsCsv(LoadingsTable table, List<Integer> rows, Map<Integer, String> codes, List<String> factorNames) {
        StringBuilder out = new StringBuilder(64 + rows.size() * (40 + 24 * factorNames.size()));
        out.append("security,n,alpha");
        factorNames.forEach(f -> out.append(",beta_").append(f));
        out.append(",r_squared,residual_vol\n");
        for (int row : rows) {
            out.append(csvText(codes.get(table.securityIds()[row]))).append(',').append(table.usable()[row])
                    .append(',').append(csvNumber(table.alpha()[row]));
            for (double[] column : table.betas()) {
                out.append(',').append(csvNumber(column[row]));
            }
            out.append(',').append(csvNumber(table.rSquared()[row])).append(',').append(csvNumber(table.residualVol()[row])).append('\n');
        }
        return out.toString();
    }

    private static void respondCsv(Context ctx, String body) {
        ctx.status(200).contentType("text/csv; charset=utf-8").result(body);
    }

    /** Empty for an undefined number, as JSON writes null. */
    private static String csvNumber(double v) {
        return Double.isFinite(v) ? NumberOutput.toString(v, true) : "";
    }

    private static String csvText(String text) {
        if (text == null) {
            return "";
        }
        if (text.indexOf(',') < 0 && text.indexOf('"') < 0 && text.indexOf('\n') < 0 && text.indexOf('\r') < 0) {
            return text;
        }
        return '"' + text.replace("\"", "\"\"") + '"';
    }

    private static LocalDate optionalDate(JsonNode body, String field) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            return null;
        }
        try {
            return LocalDate.parse(node.asText());
        } catch (DateTimeParseException e) {
            throw ApiProblem.badRequest("Field '" + field + "' must be a date yyyy-mm-dd, got " + node + ".");
        }
    }

    private static Integer optionalInt(JsonNode body, String field) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isIntegralNumber() || !node.canConvertToInt() || node.asInt() < 1 || node.asInt() > MAX_WINDOW) {
            throw ApiProblem.badRequest("Field '" + field + "' must be a whole number from 1 to " + MAX_WINDOW + ", got " + node + ".");
        }
        return node.asInt();
    }

    private static List<String> optionalNames(JsonNode body, String field) {
        JsonNode node = body.get(field);
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isArray()) {
            throw ApiProblem.badRequest("Field '" + field + "' must be an array of factor names.");
        }
        List<String> names = new ArrayList<>();
        for (JsonNode n : node) {
            if (!n.isTextual() || n.asText().isBlank()) {
                throw ApiProblem.badRequest("Field '" + field + "' must hold factor names (non-empty strings), got " + n + ".");
            }
            names.add(n.asText());
        }
        return names;
    }
}
