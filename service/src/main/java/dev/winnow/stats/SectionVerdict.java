package dev.winnow.stats;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * A section's verdict, the thresholds its rule used (by name), and the reason in plain words.
 *
 * @param verdict    holds, weak, fails or not_enough_data
 * @param thresholds the numbers the rule compared against, by their wire names, in a fixed order
 * @param reason     one sentence saying which rule decided
 */
public record SectionVerdict(Verdict verdict, Map<String, Number> thresholds, String reason) {

    public SectionVerdict {
        AnalyticsChecks.notNull(verdict, "verdict");
        thresholds = Collections.unmodifiableMap(new LinkedHashMap<>(AnalyticsChecks.notNull(thresholds, "thresholds")));
        AnalyticsChecks.notNull(reason, "reason");
    }
}
