package dev.winnow.ingest;

import java.util.BitSet;

/**
 * First-pass state of one extra column: what its cells looked like, and for a new column the NaN/infinity cells
 * whose errors wait until the column's type is known.
 *
 * <p>Type rule: a column in the existing schema keeps its type. A new column is NUMBER when it has at least one
 * non-empty cell and every non-empty cell is a number or a NaN/infinity literal (those cells are then errors);
 * any other text makes it LABEL. A new column with no value at all is LABEL.
 */
final class ExtraColumn {

    final String name;
    final int field;
    /** Type from earlier uploads, null for a new column. */
    final ColumnType existingType;
    final ColumnTally tally = new ColumnTally();
    boolean sawText;
    boolean sawNumber;

    private long deferredCells;
    private final long[] deferredLines = new long[ErrorCollector.MAX_KEPT];
    private final String[] deferredTexts = new String[ErrorCollector.MAX_KEPT];
    /** Rows whose only problems are deferred non-finite cells, by row index. */
    private BitSet deferredRows;

    ExtraColumn(String name, int field, ColumnType existingType) {
        this.name = name;
        this.field = field;
        this.existingType = existingType;
    }

    /** Type inferred from this upload's cells alone. */
    ColumnType typeInUpload() {
        return sawNumber && !sawText ? ColumnType.NUMBER : ColumnType.LABEL;
    }

    ColumnType finalType() {
        return existingType != null ? existingType : typeInUpload();
    }

    /** An existing label column whose values in this upload are all numbers. */
    boolean contradictsSchema() {
        return existingType == ColumnType.LABEL && sawNumber && !sawText;
    }

    void deferNonFinite(long line, String text) {
        if (deferredCells < deferredLines.length) {
            deferredLines[(int) deferredCells] = line;
            deferredTexts[(int) deferredCells] = text;
        }
        deferredCells++;
    }

    void deferRow(long rowIndex) {
        if (deferredRows == null) {
            deferredRows = new BitSet();
        }
        deferredRows.set(Math.toIntExact(rowIndex));
    }

    /** Adds the state of the same column over a later part of the file (lines and rows offset as given). */
    void merge(ExtraColumn other, long lineOffset, long rowOffset) {
        tally.merge(other.tally);
        sawText |= other.sawText;
        sawNumber |= other.sawNumber;
        int kept = (int) Math.min(other.deferredCells, other.deferredLines.length);
        for (int i = 0; i < kept; i++) {
            if (deferredCells < deferredLines.length) {
                deferredLines[(int) deferredCells] = other.deferredLines[i] + lineOffset;
                deferredTexts[(int) deferredCells] = other.deferredTexts[i];
            }
            deferredCells++;
        }
        deferredCells += other.deferredCells - kept;
        if (other.deferredRows != null) {
            for (int r = other.deferredRows.nextSetBit(0); r >= 0; r = other.deferredRows.nextSetBit(r + 1)) {
                deferRow(r + rowOffset);
            }
        }
    }

    /**
     * Once the type is known: for a NUMBER column report the deferred cells and add their otherwise clean rows to
     * {@code rejectedRows}.
     */
    void settleDeferred(ErrorCollector errors, BitSet rejectedRows) {
        if (finalType() != ColumnType.NUMBER || deferredCells == 0) {
            return;
        }
        int kept = (int) Math.min(deferredCells, deferredLines.length);
        for (int i = 0; i < kept; i++) {
            errors.add(deferredLines[i], name, Messages.notFinite(deferredTexts[i]));
        }
        errors.countOnly(deferredCells - kept);
        if (deferredRows != null) {
            rejectedRows.or(deferredRows);
        }
    }
}
