package dev.winnow.jobs;

import dev.winnow.store.JobStore.Counters;

import java.util.List;
import java.util.Map;

/**
 * What a finished job reports: success, its row counters, line-numbered errors ({@code line}, {@code column},
 * {@code message}) and a free-form report (for example the factors it rebuilt).
 */
public record JobOutcome(boolean succeeded, Counters counters, List<Map<String, Object>> errors, Map<String, Object> report) {

    public static JobOutcome success(Counters counters, Map<String, Object> report) {
        return new JobOutcome(true, counters, List.of(), report);
    }

    public static JobOutcome failure(Counters counters, List<Map<String, Object>> errors) {
        return new JobOutcome(false, counters, errors, Map.of());
    }

    public static Map<String, Object> error(Long line, String column, String message) {
        Map<String, Object> e = new java.util.LinkedHashMap<>();
        e.put("line", line);
        e.put("column", column);
        e.put("message", message);
        return e;
    }
}
