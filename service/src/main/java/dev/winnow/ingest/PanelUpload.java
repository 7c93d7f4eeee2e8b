package dev.winnow.ingest;

import java.nio.file.Path;
import java.time.LocalDate;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;

/**
 * A spooled panel upload and what the parser must know about the panel it goes into.
 *
 * @param file           the uploaded CSV on disk; read two or more times
 * @param gzip           whether the file is gzip-compressed
 * @param mode           append (dates after {@code lastDate} only) or revise (any dates)
 * @param lastDate       the panel's last stored date, null for a new panel
 * @param existingSchema types of the panel's extra columns from earlier uploads; never the fixed columns
 *                       date, security, return or market_cap
 */
public record PanelUpload(Path file, boolean gzip, UploadMode mode, LocalDate lastDate,
                          Map<String, ColumnType> existingSchema) {

    /** Columns every panel has, with fixed meaning; all other columns are extra. */
    public static final String DATE = "date";
    public static final String SECURITY = "security";
    public static final String RETURN = "return";
    public static final String MARKET_CAP = "market_cap";

    public PanelUpload {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(mode, "mode");
        Objects.requireNonNull(existingSchema, "existingSchema (pass an empty map for a new panel)");
        for (Map.Entry<String, ColumnType> column : existingSchema.entrySet()) {
            if (isFixedColumn(column.getKey())) {
                throw new IllegalArgumentException("existingSchema lists the fixed column '" + column.getKey()
                        + "': pass only the extra columns (characteristics and labels)");
            }
            Objects.requireNonNull(column.getValue(), "type of column " + column.getKey());
        }
        existingSchema = Collections.unmodifiableMap(new LinkedHashMap<>(existingSchema));
    }

    public static boolean isFixedColumn(String name) {
        return DATE.equals(name) || SECURITY.equals(name) || RETURN.equals(name) || MARKET_CAP.equals(name);
    }
}
