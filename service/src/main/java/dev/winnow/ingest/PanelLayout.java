package dev.winnow.ingest;

import java.util.ArrayList;
import java.util.List;

/** Where a panel upload's columns sit in each record: the fixed columns by role, the rest as extra columns. */
final class PanelLayout {

    static final String REQUIRED_COLUMNS = "date, security and return (market_cap and other columns optional)";

    final HeaderRow header;
    final int dateField;
    final int securityField;
    final int returnField;
    /** -1 when the upload has no market_cap column. */
    final int marketCapField;
    final int[] extraFields;
    final String[] extraNames;

    private PanelLayout(HeaderRow header) {
        this.header = header;
        dateField = header.indexOf(PanelUpload.DATE);
        securityField = header.indexOf(PanelUpload.SECURITY);
        returnField = header.indexOf(PanelUpload.RETURN);
        marketCapField = header.indexOf(PanelUpload.MARKET_CAP);
        List<Integer> fields = new ArrayList<>();
        for (int i = 0; i < header.width(); i++) {
            if (!PanelUpload.isFixedColumn(header.names().get(i))) {
                fields.add(i);
            }
        }
        extraFields = fields.stream().mapToInt(Integer::intValue).toArray();
        extraNames = fields.stream().map(header.names()::get).toArray(String[]::new);
    }

    /** The layout, or null with an error per missing required column. */
    static PanelLayout of(HeaderRow header, ErrorCollector errors) {
        boolean complete = true;
        for (String required : List.of(PanelUpload.DATE, PanelUpload.SECURITY, PanelUpload.RETURN)) {
            if (header.indexOf(required) < 0) {
                errors.add(header.line(), required, Messages.missingColumn(required, REQUIRED_COLUMNS));
                complete = false;
            }
        }
        return complete ? new PanelLayout(header) : null;
    }

    int width() {
        return header.width();
    }
}
