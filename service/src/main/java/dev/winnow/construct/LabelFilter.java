package dev.winnow.construct;

import java.util.List;

/**
 * An include-list or exclude-list on one label column. A missing label is excluded by an include-list
 * and kept by an exclude-list.
 */
public record LabelFilter(Mode mode, List<String> values) {

    public enum Mode {
        INCLUDE,
        EXCLUDE
    }

    public LabelFilter {
        values = values == null ? List.of() : List.copyOf(values);
    }

    public static LabelFilter include(String... values) {
        return new LabelFilter(Mode.INCLUDE, List.of(values));
    }

    public static LabelFilter exclude(String... values) {
        return new LabelFilter(Mode.EXCLUDE, List.of(values));
    }

    public boolean admits(String label) {
        boolean listed = label != null && values.contains(label);
        return mode == Mode.INCLUDE ? listed : !listed;
    }
}
