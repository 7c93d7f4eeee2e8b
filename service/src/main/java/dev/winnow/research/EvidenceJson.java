package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonUnwrapped;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.stats.SectionVerdict;
import dev.winnow.stats.TrialRow;
import dev.winnow.stats.TrialStatistics;
import dev.winnow.stats.Verdict;

import java.util.Map;

/**
 * The wire form of evidence values: records with snake_case names, written by the API's mapper (NaN as null; the
 * {@code stats} records they hold, such as {@code PeriodStatistics}, get their snake_case names there).
 */
public final class EvidenceJson {
    private EvidenceJson() {
    }

    /** A row of {@code GET /v1/evidence}, and the numbers of a factor's significance section. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    public record Row(String factor, int version, boolean retired, String status, String theme, String family, int n, double mean,
                      @JsonProperty("nw_t_stat") double nwTStat, double pValue, double pBonferroni, double pHolm, double pBh,
                      double pBy, Boolean passesT3, double sharpeMonthly, double psr, double deflatedSharpe, String note) {
    }

    /** The trial and its row of the table. */
    public static Row row(TrialLibrary.Trial trial, TrialRow row) {
        TrialStatistics s = row.statistics();
        return new Row(trial.name(), trial.version().version(), trial.version().retired(), trial.version().status().wireName(),
                trial.theme(), trial.version().family(), s.n(), s.mean(), s.nwTStat(), s.pValue(), row.pBonferroni(), row.pHolm(),
                row.pBh(), row.pBy(), row.passesT3(), s.sharpe(), row.psr(), row.deflatedSharpe(), trial.note());
    }

    /** A version that is no trial, with the reason: a row of {@code excluded} in {@code GET /v1/evidence}. */
    public record Excluded(String factor, int version, boolean retired, String theme, String frequency, String reason) {
    }

    public static Excluded excluded(TrialLibrary.Trial trial) {
        return new Excluded(trial.name(), trial.version().version(), trial.version().retired(), trial.theme(),
                trial.basis().nativeFrequency().wireName(), trial.exclusionReason());
    }

    /** A section of a factor's evidence: its numbers (at the top level of the section), then verdict, thresholds, reason. */
    public record Section<N>(@JsonUnwrapped N numbers, String verdict, Map<String, Number> thresholds, String reason) {
    }

    /**
     * A section with its verdict. When the version cannot be judged at all ({@code unavailable} not null: not ready,
     * or no trial), the verdict is not_enough_data with that reason.
     */
    public static <N> Section<N> section(N numbers, SectionVerdict verdict, String unavailable) {
        return new Section<>(numbers, unavailable == null ? verdict.verdict().wireName() : Verdict.NOT_ENOUGH_DATA.wireName(),
                verdict.thresholds(), unavailable == null ? verdict.reason() : unavailable);
    }
}
