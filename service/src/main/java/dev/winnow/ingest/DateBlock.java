package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import dev.winnow.store.SliceDecimals;
import java.time.LocalDate;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The rows of one date collected during the second pass, column by column in primitive arrays sized from the first
 * pass's row count. Rows arrive in file order; {@link #toCrossSection} sorts them by security id.
 *
 * <p>A block made {@link #withForms() with forms} also keeps the decimal form of each number
 * ({@link NumberCell#decimal()}) for the slice encoder, while it holds at most {@value #MAX_ROWS_WITH_FORMS} rows;
 * a larger block drops them (the encoder then finds them by trial), so they never add more than a few MB.
 */
final class DateBlock {

    /** Called for each row whose security already has a row at this date. */
    interface DuplicateListener {
        void duplicate(int securityId, long firstLine, long line);
    }

    int[] ids;
    long[] lines;
    double[] returns;
    double[] marketCaps;
    final double[][] numbers;
    final String[][] labels;
    int size;
    /** Decimal forms of the returns, market caps and number columns; null when not kept. */
    long[] returnForms;
    long[] capForms;
    long[][] numberForms;
    /** The row order of the last {@link #toCrossSection}, null when it kept the file order. */
    private int[] order;

    /** Rows beyond which a block stops keeping decimal forms. */
    static final int MAX_ROWS_WITH_FORMS = 1 << 16;

    DateBlock(int rows, int numberColumns, int labelColumns) {
        ids = new int[rows];
        lines = new long[rows];
        returns = new double[rows];
        marketCaps = new double[rows];
        numbers = new double[numberColumns][rows];
        labels = new String[labelColumns][rows];
    }

    /** Starts keeping decimal forms (call before the first row); a no-op for a block too large to keep them. */
    DateBlock withForms() {
        int rows = ids.length;
        if (rows <= MAX_ROWS_WITH_FORMS) {
            returnForms = new long[rows];
            capForms = new long[rows];
            numberForms = new long[numbers.length][rows];
        }
        return this;
    }

    boolean keepsForms() {
        return returnForms != null;
    }

    /** Makes room for one more row, doubling the arrays when full (for blocks whose row count is not known ahead). */
    void ensureRoom() {
        if (size < ids.length) {
            return;
        }
        int capacity = Math.max(16, ids.length * 2);
        ids = Arrays.copyOf(ids, capacity);
        lines = Arrays.copyOf(lines, capacity);
        returns = Arrays.copyOf(returns, capacity);
        marketCaps = Arrays.copyOf(marketCaps, capacity);
        for (int c = 0; c < numbers.length; c++) {
            numbers[c] = Arrays.copyOf(numbers[c], capacity);
        }
        for (int c = 0; c < labels.length; c++) {
            labels[c] = Arrays.copyOf(labels[c], capacity);
        }
        if (returnForms != null) {
            if (capacity > MAX_ROWS_WITH_FORMS) {
                returnForms = null;
                capForms = null;
                numberForms = null;
            } else {
                returnForms = Arrays.copyOf(returnForms, capacity);
                capForms = Arrays.copyOf(capForms, capacity);
                for (int c = 0; c < numberForms.length; c++) {
                    numberForms[c] = Arrays.copyOf(numberForms[c], capacity);
                }
            }
        }
    }

    /** Cuts the arrays to the rows held, so that a block filled through {@link #ensureRoom} is full. */
    void trim() {
        if (size == ids.length) {
            return;
        }
        ids = Arrays.copyOf(ids, size);
        lines = Arrays.copyOf(lines, size);
        returns = Arrays.copyOf(returns, size);
        marketCaps = Arrays.copyOf(marketCaps, size);
        for (int c = 0; c < numbers.length; c++) {
            numbers[c] = Arrays.copyOf(numbers[c], size);
        }
        for (int c = 0; c < labels.length; c++) {
            labels[c] = Arrays.copyOf(labels[c], size);
        }
        if (returnForms != null) {
            returnForms = Arrays.copyOf(returnForms, size);
            capForms = Arrays.copyOf(capForms, size);
            for (int c = 0; c < numberForms.length; c++) {
                numberForms[c] = Arrays.copyOf(numberForms[c], size);
            }
        }
    }

    boolean isFull() {
        return size == ids.length;
    }

    /**
     * The rows as a cross-section sorted by security id, or null when a security occurs twice (each repeat is
     * reported to {@code duplicates}).
     */
    CrossSection toCrossSection(LocalDate date, String[] numberNames, String[] labelNames,
                                DuplicateListener duplicates) {
        int[] order = sortedOrder();
        this.order = order;
        if (order != null && reportDuplicates(order, duplicates)) {
            return null;
        }
        Map<String, double[]> numberColumns = new LinkedHashMap<>();
        for (int c = 0; c < numberNames.length; c++) {
            numberColumns.put(numberNames[c], permuted(numbers[c], order));
        }
        Map<String, String[]> labelColumns = new LinkedHashMap<>();
        for (int c = 0; c < labelNames.length; c++) {
            labelColumns.put(labelNames[c], permuted(labels[c], order));
        }
        int[] sortedIds = order == null ? ids : Arrays.stream(order).map(i -> ids[i]).toArray();
        return new CrossSection(date, sortedIds, permuted(returns, order), permuted(marketCaps, order),
                numberColumns, labelColumns);
    }

    /**
     * The decimal forms of the cross-section the last {@link #toCrossSection} formed, in its row order (number
     * columns in the order of its names); null when the block keeps none.
     */
    SliceDecimals decimals() {
        if (returnForms == null) {
            return null;
        }
        long[][] columns = new long[numberForms.length][];
        for (int c = 0; c < columns.length; c++) {
            columns[c] = permuted(numberForms[c], order);
        }
        return new SliceDecimals(permuted(returnForms, order), permuted(capForms, order), columns);
    }

    /** Row indexes by (id, file order), or null when the ids already increase strictly. */
    private int[] sortedOrder() {
        boolean increasing = true;
        for (int i = 1; i < size && increasing; i++) {
            increasing = ids[i] > ids[i - 1];
        }
        if (increasing) {
            return null;
        }
        long[] keys = new long[size];
        for (int i = 0; i < size; i++) {
            keys[i] = ((long) ids[i] << 32) | i;
        }
        Arrays.sort(keys);
        int[] order = new int[size];
        for (int i = 0; i < size; i++) {
            order[i] = (int) keys[i];
        }
        return order;
    }

    private boolean reportDuplicates(int[] order, DuplicateListener duplicates) {
        boolean found = false;
        int first = order[0];
        for (int k = 1; k < size; k++) {
            int row = order[k];
            if (ids[row] == ids[first]) {
                duplicates.duplicate(ids[row], lines[first], lines[row]);
                found = true;
            } else {
                first = row;
            }
        }
        return found;
    }

    private static double[] permuted(double[] values, int[] order) {
        if (order == null) {
            return values;
        }
        double[] out = new double[order.length];
        for (int i = 0; i < order.length; i++) {
            out[i] = values[order[i]];
        }
        return out;
    }

    private static long[] permuted(long[] values, int[] order) {
        if (order == null) {
            return values;
        }
        long[] out = new long[order.length];
        for (int i = 0; i < order.length; i++) {
            out[i] = values[order[i]];
        }
        return out;
    }

    private static String[] permuted(String[] values, int[] order) {
        if (order == null) {
            return values;
        }
        String[] out = new String[order.length];
        for (int i = 0; i < order.length; i++) {
            out[i] = values[order[i]];
        }
        return out;
    }
}
