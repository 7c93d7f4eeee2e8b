package dev.winnow.store;

/**
 * Every limit the service enforces on what it accepts, in one place. The byte limits come from the environment
 * ({@code WINNOW_MAX_UPLOAD_BYTES}, {@code WINNOW_MIN_FREE_BYTES}); the text widths follow the store's columns and
 * are fixed. Parsers and request readers take their limits from here, so a rewrite keeps them.
 *
 * @param maxUploadBytes largest upload body, counted on the bytes received and again on the decoded bytes of a
 *                       gzip upload (default 16 GiB); passing it answers 413
 * @param minFreeBytes   free space the data directory must keep (default 1 GiB): an upload is refused with 507 while
 *                       the free space is below it or would fall below it with the upload's declared length
 */
public record Limits(long maxUploadBytes, long minFreeBytes) {

    public static final long GIB = 1L << 30;
    public static final Limits DEFAULTS = new Limits(16 * GIB, GIB);

    /** Longest security identifier in a panel upload, in characters (the width of the stored code). */
    public static final int MAX_SECURITY_CHARS = 200;
    /** Longest label cell (sector, listing tier, ...) in a panel upload, in characters. */
    public static final int MAX_LABEL_CHARS = 1_000;
    /** Most rows one date of a panel upload may hold; the second pass holds one date's rows at a time. */
    public static final int MAX_ROWS_PER_DATE = 1_000_000;
    /** Longest rationale of a factor definition, in characters. */
    public static final int MAX_RATIONALE_CHARS = 10_000;
    /** Longest other text field of a factor definition (theme, column names, label values), in characters. */
    public static final int MAX_DEFINITION_TEXT_CHARS = 200;
    /** Longest canonical factor definition, in characters (the width of the stored definition). */
    public static final int MAX_DEFINITION_CHARS = 100_000;
    /** Largest JSON request body, in bytes. */
    public static final int MAX_JSON_BODY_BYTES = 1_000_000;

    public Limits {
        if (maxUploadBytes < 1) {
            throw new IllegalArgumentException("WINNOW_MAX_UPLOAD_BYTES must be at least 1, got " + maxUploadBytes);
        }
        if (minFreeBytes < 0) {
            throw new IllegalArgumentException("WINNOW_MIN_FREE_BYTES must be 0 or more, got " + minFreeBytes);
        }
    }

    /** A byte count from the environment: a whole number, optionally with a binary suffix K, M, G or T (KiB ...). */
    public static long parseBytes(String variable, String text) {
        String t = text.trim().toUpperCase(java.util.Locale.ROOT);
        long unit = 1;
        if (t.endsWith("IB")) {
            t = t.substring(0, t.length() - 2);
        } else if (t.endsWith("B")) {
            t = t.substring(0, t.length() - 1);
        }
        if (!t.isEmpty()) {
            switch (t.charAt(t.length() - 1)) {
                case 'K' -> unit = 1L << 10;
                case 'M' -> unit = 1L << 20;
                case 'G' -> unit = 1L << 30;
                case 'T' -> unit = 1L << 40;
                default -> unit = 1;
            }
            if (unit > 1) {
                t = t.substring(0, t.length() - 1).trim();
            }
        }
        try {
            long value = Long.parseLong(t);
            if (value < 0 || value > Long.MAX_VALUE / unit) {
                throw new NumberFormatException();
            }
            return value * unit;
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(variable + " must be a number of bytes such as 1073741824 or 1G, got '" + text + "'");
        }
    }

    /** A byte count for people: 16 GiB, 1.5 MiB, 900 bytes. */
    public static String describe(long bytes) {
        String[] units = {"KiB", "MiB", "GiB", "TiB"};
        if (bytes < 1024) {
            return bytes + " bytes";
        }
        double v = bytes;
        int u = -1;
        while (v >= 1024 && u < units.length - 1) {
            v /= 1024;
            u++;
        }
        String number = v == Math.rint(v) ? String.valueOf((long) v) : String.format(java.util.Locale.ROOT, "%.1f", v);
        return number + " " + units[u] + " (" + bytes + " bytes)";
    }
}
