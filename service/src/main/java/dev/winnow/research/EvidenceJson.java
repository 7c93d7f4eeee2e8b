package dev.winnow.research;

import dev.winnow.stats.PeriodStatistics;
import dev.winnow.stats.SectionVerdict;
import dev.winnow.stats.TrialRow;
import dev.winnow.stats.TrialStatistics;
import dev.winnow.stats.Verdict;

import java.util.LinkedHashMap;
import java.util.Map;

/** The wire form of evidence values (snake_case maps; NaN becomes null when written). */
public final class EvidenceJson {
    private EvidenceJson() {
    }

    /** A row of {@code GET /v1/evidence}: the trial and its row of the table. */
    public static Map<String, Object> row(TrialLibrary.Trial trial, TrialRow row) {
        TrialStatistics s = row.statistics();
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factor", trial.name());
        out.put("version", trial.version().version());
        out.put("retired", trial.version().retired());
        out.put("status", trial.version().status().wireName());
        out.put("theme", trial.theme());
        out.put("family", trial.version().family());
        out.put("n", s.n());
        out.put("mean", s.mean());
        out.put("nw_t_stat", s.nwTStat());
        out.put("p_value", s.pValue());
        out.put("p_bonferroni", row.pBonferroni());
        out.put("p_holm", row.pHolm());
        out.put("p_bh", row.pBh());
        out.put("p_by", row.pBy());
        out.put("passes_t3", row.passesT3());
        out.put("sharpe_monthly", s.sharpe());
        out.put("psr", row.psr());
        out.put("deflated_sharpe", row.deflatedSharpe());
        out.put("note", trial.note());
        return out;
    }

    /** A version that is no trial, with the reason: a row of {@code excluded} in {@code GET /v1/evidence}. */
    public record Excluded(String factor, int version, boolean retired, String theme, String frequency, String reason) {
    }

    public static Excluded excluded(TrialLibrary.Trial trial) {
        return new Excluded(trial.name(), trial.version().version(), trial.version().retired(), trial.theme(),
                trial.basis().nativeFrequency().wireName(), trial.exclusionReason());
    }

    public static Map<String, Object> period(PeriodStatistics p) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("from", p.from());
        out.put("to", p.to());
        out.put("n", p.n());
        out.put("mean", p.mean());
        out.put("nw_t_stat", p.nwTStat());
        return out;
    }

    /**
     * A section: its numbers, then verdict, thresholds and reason. When the version cannot be judged at all
     * ({@code unavailable} not null: not ready, or no trial), the verdict is not_enough_data with that reason.
     */
    public static Map<String, Object> section(Map<String, Object> numbers, SectionVerdict verdict, String unavailable) {
        Map<String, Object> out = new LinkedHashMap<>(numbers);
        out.put("verdict", unavailable == null ? verdict.verdict().wireName() : Verdict.NOT_ENOUGH_DATA.wireName());
        out.put("thresholds", verdict.thresholds());
        out.put("reason", unavailable == null ? verdict.reason() : unavailable);
        return out;
    }
}
