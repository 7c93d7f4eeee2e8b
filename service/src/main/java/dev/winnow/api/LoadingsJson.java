package dev.winnow.api;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.StreamWriteFeature;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
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
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

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

    static CharacteristicAnswer characteristic(Characteristic answer) {
        double[][] scores = answer.scores();
        List<SecurityExposures> securities = new ArrayList<>(answer.rows().size());
        for (int row : answer.rows()) {
            double[] exposures = new double[scores.length];
            for (int c = 0; c < scores.length; c++) {
                exposures[c] = scores[c][row];
            }
            securities.add(new SecurityExposures(answer.codes().get(answer.securityIds()[row]), exposures));
        }
        return new CharacteristicAnswer(answer.panel().name(), answer.date(), "characteristic", answer.columns(), securities);
    }

    record SecurityExposures(String security, double[] exposures) {
    }

    /** {@code GET /v1/loadings?kind=characteristic}: each security's standardised characteristics. */
    record CharacteristicAnswer(String panel, LocalDate date, String kind, List<String> columns, List<SecurityExposures> securities) {
    }

    static HistoryAnswer history(History answer) {
        SecurityLoadingsHistory history = answer.history();
        LoadingsSpec spec = answer.spec();
        return new HistoryAnswer(answer.panel().name(), answer.security(), spec.factors(), spec.window(), spec.minObs(),
                history == null ? List.of() : history.dates(), history == null ? new int[0] : history.usable(),
                history == null ? new double[0] : history.alpha(), history == null ? new double[spec.factorCount()][0] : history.betas(),
                history == null ? new double[0] : history.rSquared(), history == null ? new double[0] : history.residualVol());
    }

    /** {@code GET /v1/loadings/{security}}: one security's regression over time. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record HistoryAnswer(String panel, String security, List<String> factors, int window, int minObs, List<LocalDate> dates, int[] n,
                         double[] alpha, double[][] betas, double[] rSquared, double[] residualVol) {
    }

    static ExposuresAnswer exposures(Exposures answer) {
        LoadingsSpec spec = answer.spec();
        return new ExposuresAnswer(answer.panel().name(), answer.date(), spec.factors(), spec.window(), spec.minObs(),
                answer.exposure().exposures(), answer.exposure().coverage(),
                answer.exposure().missingHoldings().stream().map(answer.securities()::get).toList());
    }

    /** {@code POST /v1/exposures}: a portfolio's factor exposures. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record ExposuresAnswer(String panel, LocalDate date, List<String> factors, int window, int minObs, double[] exposures,
                           double coverage, List<String> missing) {
    }

    static ConfigAnswer config(PanelRecord panel, LoadingsConfig config) {
        return new ConfigAnswer(panel.name(), config.spec().factors(), config.spec().window(), config.spec().minObs(), config.updatedAt());
    }

    /** A panel's loadings config. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record ConfigAnswer(String panel, List<String> factors, int window, int minObs, java.time.OffsetDateTime updatedAt) {
    }
}
