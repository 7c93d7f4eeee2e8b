package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonValue;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;

import java.time.LocalDate;
import java.util.Locale;

/**
 * What an upload did to a panel's stored loadings ({@link LoadingsRefresh#afterUpload}), as the upload job reports it.
 * The counts are there when the loadings were refreshed, the reason when they were skipped or failed; the dates
 * computed again only when some were.
 *
 * @param revision        whether the upload revised existing dates
 * @param loadings        what happened
 * @param reason          why they were skipped or failed; null when refreshed
 * @param computedDates   dates computed and stored; null unless refreshed
 * @param restampedDates  dates kept and marked current; null unless refreshed
 * @param firstComputed   the first date computed; null when none was
 * @param lastComputed    the last date computed; null when none was
 */
@JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
@JsonInclude(JsonInclude.Include.NON_NULL)
public record LoadingsUpdate(boolean revision, Outcome loadings, String reason, Integer computedDates,
                             Integer restampedDates, LocalDate firstComputed, LocalDate lastComputed) {

    /** What happened to the stored loadings. */
    public enum Outcome {
        REFRESHED, SKIPPED, FAILED;

        @JsonValue
        public String wireName() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    static LoadingsUpdate refreshed(boolean revision, int computed, int restamped, LocalDate first, LocalDate last) {
        return new LoadingsUpdate(revision, Outcome.REFRESHED, null, computed, restamped, first, last);
    }

    static LoadingsUpdate notRefreshed(boolean revision, Outcome outcome, String reason) {
        return new LoadingsUpdate(revision, outcome, reason, null, null, null, null);
    }
}
