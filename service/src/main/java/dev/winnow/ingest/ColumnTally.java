package dev.winnow.ingest;

/** Running counts and numeric range of one column during the first pass. */
final class ColumnTally {

    private long present;
    private long missing;
    private long numbers;
    private double min = Double.POSITIVE_INFINITY;
    private double max = Double.NEGATIVE_INFINITY;
    private double sum;

    void missing() {
        missing++;
    }

    void text() {
        present++;
    }

    void number(double value) {
        present++;
        numbers++;
        min = Math.min(min, value);
        max = Math.max(max, value);
        sum += value;
    }

    /** A non-empty cell that is not counted in the numeric range (for example a NaN literal). */
    void unusableNumber() {
        present++;
    }

    /** Adds another tally of the same column (a later part of the file). */
    void merge(ColumnTally other) {
        present += other.present;
        missing += other.missing;
        numbers += other.numbers;
        min = Math.min(min, other.min);
        max = Math.max(max, other.max);
        sum += other.sum;
    }

    ColumnSummary summary(ColumnType type) {
        if (type == ColumnType.LABEL || numbers == 0) {
            return new ColumnSummary(type, present, missing, Double.NaN, Double.NaN, Double.NaN);
        }
        return new ColumnSummary(type, present, missing, min, max, sum / numbers);
    }
}
