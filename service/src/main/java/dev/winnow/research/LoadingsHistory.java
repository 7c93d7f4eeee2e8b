package dev.winnow.research;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;

import java.time.LocalDate;
import java.util.List;

/**
 * What a computation of a panel's whole loadings history did ({@link LoadingsRefresh#computeHistory}): the dates
 * computed and stored, the configuration they were computed with, and the panel's date range (null, and left out,
 * for a panel without dates).
 */
@JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
@JsonInclude(JsonInclude.Include.NON_NULL)
public record LoadingsHistory(long panelId, int computedDates, List<String> factors, int window, int minObs,
                              LocalDate firstDate, LocalDate lastDate) {
    public LoadingsHistory {
        factors = List.copyOf(factors);
    }
}
