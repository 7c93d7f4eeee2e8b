package dev.winnow.ingest;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Pattern;

/**
 * Reads and checks the header record: names are trimmed, non-empty, unique (case-sensitive) and match
 * {@link #NAME_PATTERN}.
 *
 * @param line  physical line of the header record
 * @param names the trimmed column names in file order
 */
record HeaderRow(long line, List<String> names) {

    static final Pattern NAME_PATTERN = Pattern.compile("[A-Za-z_][A-Za-z0-9_]{0,62}");

    /**
     * Reads the first non-blank record as the header. Returns null, with the problems added to {@code errors},
     * when the input is empty or the header breaks a rule; {@code columns} names the expected columns for messages.
     */
    static HeaderRow read(CsvTokenizer csv, ErrorCollector errors, String columns) throws IOException {
        if (!nextNonBlank(csv)) {
            errors.add(1, null, Messages.emptyUpload(columns));
            return null;
        }
        long line = csv.recordLine();
        if (csv.unterminatedQuote()) {
            errors.add(line, null, Messages.unterminatedQuote());
            return null;
        }
        if (csv.malformedField() >= 0) {
            errors.add(line, null, Messages.strayQuote());
            return null;
        }
        List<String> names = new ArrayList<>();
        Map<String, Integer> positions = new HashMap<>();
        boolean ok = true;
        for (int i = 0; i < csv.fieldCount(); i++) {
            String name = csv.text(i).strip();
            names.add(name);
            int position = i + 1;
            if (name.isEmpty()) {
                errors.add(line, null, Messages.emptyColumnName(position));
                ok = false;
            } else if (!NAME_PATTERN.matcher(name).matches()) {
                errors.add(line, name, Messages.badColumnName(name));
                ok = false;
            } else {
                Integer first = positions.putIfAbsent(name, position);
                if (first != null) {
                    errors.add(line, name, Messages.duplicateColumnName(name, first, position));
                    ok = false;
                }
            }
        }
        return ok ? new HeaderRow(line, List.copyOf(names)) : null;
    }

    /** Advances to the next record that is not an empty line; false at the end of input. */
    static boolean nextNonBlank(CsvTokenizer csv) throws IOException {
        while (csv.next()) {
            if (!csv.isBlankLine()) {
                return true;
            }
        }
        return false;
    }

    int indexOf(String name) {
        return names.indexOf(name);
    }

    int width() {
        return names.size();
    }
}
