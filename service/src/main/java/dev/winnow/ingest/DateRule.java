package dev.winnow.ingest;

import java.time.LocalDate;

/**
 * Reads a date cell and applies the rules every upload shares: present, yyyy-mm-dd, and after the last stored date
 * when appending.
 */
final class DateRule {

    private final UploadMode mode;
    private final LocalDate lastDate;
    private final DateCell cell = new DateCell();
    private LocalDate date;

    DateRule(UploadMode mode, LocalDate lastDate) {
        this.mode = mode;
        this.lastDate = lastDate;
    }

    /** Reads the field; returns what is wrong with it, or null. {@link #date()} is the date read, null if none. */
    String check(CsvTokenizer csv, int field) {
        date = cell.read(csv.buffer(), csv.start(field), csv.end(field));
        if (date == null) {
            return cell.kind() == DateCell.Kind.EMPTY
                    ? Messages.emptyCell(PanelUpload.DATE, "2024-03-28")
                    : Messages.notADate(csv.text(field).strip());
        }
        if (mode == UploadMode.APPEND && lastDate != null && !date.isAfter(lastDate)) {
            return Messages.dateNotAfterLast(date, lastDate);
        }
        return null;
    }

    LocalDate date() {
        return date;
    }
}
