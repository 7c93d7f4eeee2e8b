package dev.winnow.construct;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * What a definition may refer to in a panel: its extra columns by type, and whether it has market_cap.
 * The return column always exists and is numeric.
 */
public record PanelSchema(Map<String, ColumnType> columns, boolean hasMarketCap) {

    public enum ColumnType {
        NUMBER,
        LABEL
    }

    public PanelSchema {
        columns = Collections.unmodifiableMap(new TreeMap<>(columns));
    }

    /** Whether a numeric column of that name can be read: return, market_cap when present, or an extra number. */
    public boolean isNumeric(String column) {
        return "return".equals(column) || ("market_cap".equals(column) && hasMarketCap)
                || columns.get(column) == ColumnType.NUMBER;
    }

    public boolean isLabel(String column) {
        return columns.get(column) == ColumnType.LABEL;
    }

    /** Numeric column names: return, market_cap when present, then the extra numbers alphabetically. */
    public List<String> numericColumns() {
        List<String> names = new ArrayList<>();
        names.add("return");
        if (hasMarketCap) {
            names.add("market_cap");
        }
        names.addAll(ofType(ColumnType.NUMBER));
        return names;
    }

    public List<String> labelColumns() {
        return ofType(ColumnType.LABEL);
    }

    private List<String> ofType(ColumnType type) {
        return columns.entrySet().stream().filter(e -> e.getValue() == type).map(Map.Entry::getKey).toList();
    }
}
