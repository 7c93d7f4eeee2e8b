package dev.winnow.api;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.StreamWriteFeature;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.SecurityLoadingsHistory;
import dev.winnow.research.LoadingsService.Characteristic;
import dev.winnow.research.LoadingsService.Exposures;
import dev.winnow.research.LoadingsService.History;
import dev.winnow.research.LoadingsService.Table;
import dev.winnow.store.LoadingsStore.LoadingsConfig;
import dev.winnow.store.PanelStore.PanelRecord;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** The JSON form of loadings answers (snake_case; NaN becomes null when written). */
final class LoadingsJson {
    /** Shortest round-trip decimals by the Schubfach algorithm: several times faster than Double.toString on Java 17. */
    private static final JsonFactory FAST_NUMBERS = JsonFactory.builder().enable(StreamWriteFeature.USE_FAST_DOUBLE_WRITER).build();

    private LoadingsJson() {
    }

    /**
     * The loadings table written field by field (a few thousand securities answer in milliseconds this way);
     * non-finite numbers are written as null, as {@link Json} does.
     */
    static byte[] table(Table answer) {
        LoadingsSpec spec = answer.spec();
        LoadingsTable table = answer.table();
        List<Integer> rows = answer.rows();
        ByteArrayOutputStream out = new ByteArrayOutputStream(256 + rows.size() * (120 + 24 * spec.factorCount()));
        try (JsonGenerator g = FAST_NUMBERS.createGenerator(out)) {
            g.writeStartObject();
            g.writeStringField("panel", answer.panel().name());
            g.writeStringField("date", answer.date().toString());
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
                g.writeStringField("security", answer.codes().get(table.securityIds()[row]));
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

    static Map<String, Object> characteristic(Characteristic answer) {
        double[][] scores = answer.scores();
        List<Map<String, Object>> securities = new ArrayList<>(answer.rows().size());
        for (int row : answer.rows()) {
            double[] exposures = new double[scores.length];
            for (int c = 0; c < scores.length; c++) {
                exposures[c] = scores[c][row];
            }
            Map<String, Object> s = new LinkedHashMap<>();
            s.put("security", answer.codes().get(answer.securityIds()[row]));
            s.put("exposures", exposures);
            securities.add(s);
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", answer.panel().name());
        out.put("date", answer.date());
        out.put("kind", "characteristic");
        out.put("columns", answer.columns());
        out.put("securities", securities);
        return out;
    }

    static Map<String, Object> history(History answer) {
        SecurityLoadingsHistory history = answer.history();
        LoadingsSpec spec = answer.spec();
        Map<String, Object> out = head(answer.panel(), "security", answer.security(), spec);
        out.put("dates", history == null ? List.of() : history.dates());
        out.put("n", history == null ? new int[0] : history.usable());
        out.put("alpha", history == null ? new double[0] : history.alpha());
        out.put("betas", history == null ? new double[spec.factorCount()][0] : history.betas());
        out.put("r_squared", history == null ? new double[0] : history.rSquared());
        out.put("residual_vol", history == null ? new double[0] : history.residualVol());
        return out;
    }

    static Map<String, Object> exposures(Exposures answer) {
        Map<String, Object> out = head(answer.panel(), "date", answer.date(), answer.spec());
        out.put("exposures", answer.exposure().exposures());
        out.put("coverage", answer.exposure().coverage());
        out.put("missing", answer.exposure().missingHoldings().stream().map(answer.securities()::get).toList());
        return out;
    }

    static Map<String, Object> config(PanelRecord panel, LoadingsConfig config) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("panel", panel.name());
        out.put("factors", config.spec().factors());
        out.put("window", config.spec().window());
        out.put("min_obs", config.spec().minObs());
        out.put("updated_at", config.updatedAt());
        return out;
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
}
