package dev.winnow.ingest;

/** Problems with a record as a whole, checked before its cells: quoting and the number of fields. */
final class RecordShape {

    private RecordShape() {
    }

    /** The record's shape problem, or null when its cells can be read. */
    static UploadError problem(CsvTokenizer csv, HeaderRow header) {
        long line = csv.recordLine();
        if (csv.unterminatedQuote()) {
            return new UploadError(line, nameOf(header, csv.fieldCount() - 1), Messages.unterminatedQuote());
        }
        if (csv.fieldCount() != header.width()) {
            return new UploadError(line, null, Messages.fieldCount(csv.fieldCount(), header.width()));
        }
        if (csv.malformedField() >= 0) {
            return new UploadError(line, nameOf(header, csv.malformedField()), Messages.strayQuote());
        }
        return null;
    }

    private static String nameOf(HeaderRow header, int field) {
        return field >= 0 && field < header.width() ? header.names().get(field) : null;
    }
}
