package dev.winnow.ingest;

import java.time.LocalDate;

/** The texts of upload errors: each says what is wrong and what to change. */
final class Messages {

    private static final int MAX_QUOTED = 40;

    private Messages() {
    }

    static String emptyUpload(String columns) {
        return "the upload is empty: send a header row naming the columns " + columns + ", then one row per line";
    }

    static String noDataRows() {
        return "the upload has a header but no data rows: add rows below the header";
    }

    static String emptyColumnName(int position) {
        return "column " + position + " of the header has no name: name every column";
    }

    static String badColumnName(String name) {
        return "column name " + quoted(name) + " is not allowed: use letters, digits and underscores, starting with "
                + "a letter or underscore, at most 63 characters (pattern [A-Za-z_][A-Za-z0-9_]{0,62})";
    }

    static String duplicateColumnName(String name, int firstPosition, int position) {
        return "column name " + quoted(name) + " appears twice in the header (columns " + firstPosition + " and "
                + position + "): rename or remove one of them";
    }

    static String missingColumn(String name, String columns) {
        return "required column " + quoted(name) + " is missing from the header: the header must name " + columns
                + " (names are case-sensitive)";
    }

    static String unexpectedColumn(String name, String columns) {
        return "unexpected column " + quoted(name) + ": this upload takes exactly the columns " + columns;
    }

    static String fieldCount(int fields, int headerFields) {
        return "the row has " + fields + " fields but the header has " + headerFields + ": enclose values that "
                + "contain commas in double quotes and give every column a value (empty when missing)";
    }

    static String unterminatedQuote() {
        return "a double-quoted value starting in this row is never closed, so the rest of the file was read as part "
                + "of it: add the closing double quote";
    }

    static String recordTooLong(int maxBytes) {
        return "this row is longer than " + maxBytes + " bytes, most likely because a double quote is never "
                + "closed: add the closing double quote";
    }

    static String strayQuote() {
        return "double quote inside a value that does not start with one: enclose the whole value in double quotes "
                + "and write each double quote inside it twice";
    }

    static String notUtf8() {
        return "the text is not valid UTF-8: save the file with UTF-8 encoding";
    }

    static String notGzip(String detail) {
        return "the file is not valid gzip data (" + detail + "): compress it again with gzip, or send it "
                + "uncompressed";
    }

    static String emptyCell(String column, String example) {
        return column + " is empty: every row needs a " + column + " (for example " + example + ")";
    }

    static String notADate(String text) {
        return quoted(text) + " is not a date: write dates as yyyy-mm-dd, for example 2024-03-28";
    }

    static String notANumber(String column, String text) {
        return quoted(text) + " is not a number: " + column + " takes decimal numbers such as 0.0125 or 1.5e-3, "
                + "or an empty cell when the value is missing";
    }

    static String notFinite(String text) {
        return quoted(text) + " is not a finite number: leave the cell empty when the value is missing";
    }

    static String returnBelowMinusOne(String text) {
        return "return " + text + " is below -1, a loss of more than 100%: returns are simple returns "
                + "(0.01 means 1%)";
    }

    static String marketCapNotPositive(String text) {
        return "market_cap " + text + " must be greater than zero: leave the cell empty when it is unknown";
    }

    static String dateNotAfterLast(LocalDate date, LocalDate lastDate) {
        return "date " + date + " is not after the last stored date " + lastDate + ": overlapping dates are an error "
                + "when appending; upload only later dates, or use mode=revise to replace the rows of these dates";
    }

    static String duplicateSecurity(String security, LocalDate date, long firstLine) {
        return "security " + quoted(security) + " appears more than once at date " + date + " (first at line "
                + firstLine + "): keep one row per security and date";
    }

    static String tooManyRowsAtDate(LocalDate date, int limit) {
        return "date " + date + " has more than " + limit + " rows, the most one date may hold: split the "
                + "securities of one date into several panels";
    }

    static String tooLong(String column, int length, int limit) {
        return column + " is " + length + " characters long, longer than the " + limit + " allowed: shorten it";
    }

    static String duplicateDate(LocalDate date, long firstLine) {
        return "date " + date + " appears more than once (first at line " + firstLine + "): keep one row per date";
    }

    static String labelColumnNowNumeric(String name) {
        return "column " + quoted(name) + " holds text labels in this panel, but every value in this upload is a "
                + "number: rename the column if it is a new numeric characteristic, or upload the labels as before";
    }

    static String quoted(String text) {
        String shown = text.length() > MAX_QUOTED ? text.substring(0, MAX_QUOTED) + "..." : text;
        return "'" + shown + "'";
    }
}
