package dev.winnow.construct;

/** A label condition "column equals value" (a missing label never matches). */
public record LabelEquals(String column, String value) {

    public boolean matches(String label) {
        return label != null && label.equals(value);
    }
}
