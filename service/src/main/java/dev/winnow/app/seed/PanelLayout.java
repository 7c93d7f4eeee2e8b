package dev.winnow.app.seed;

import java.io.BufferedOutputStream;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.zip.GZIPOutputStream;

/**
 * The column layout shared by the demo panel and the synthetic benchmark panel, and the way their rows are written:
 * {@code date,security,return,market_cap,<characteristics>,sector,listing_tier}, ISO dates, numbers with
 * {@value #SIGNIFICANT_DIGITS} significant digits, empty cells for missing values.
 */
final class PanelLayout {

    static final int SIGNIFICANT_DIGITS = 8;

    /** Numeric characteristic columns in file order. */
    static final List<String> CHARACTERISTICS = List.of(
            "book_to_price", "momentum_12_1", "gross_profitability", "asset_growth",
            "noise_alpha", "noise_beta", "noise_gamma");

    static final String HEADER = "date,security,return,market_cap," + String.join(",", CHARACTERISTICS)
            + ",sector,listing_tier";

    /** Invented industry groupings of the invented market. */
    static final List<String> SECTORS = List.of(
            "Ferrolith", "Aquaverde", "Lumenrail", "Cindervale", "Quillmark", "Brightvault", "Mossfield", "Skyloom");

    static final String MAIN_TIER = "main";
    static final String GROWTH_TIER = "growth";

    private PanelLayout() {
    }

    /** Rounds a value to what the panel file shows, so a simulation can use exactly the published number. */
    static double published(double value) {
        return Double.isNaN(value) ? Double.NaN : Double.parseDouble(SignificantDigits.format(value, SIGNIFICANT_DIGITS));
    }

    /** Appends one panel row, newline included; {@code characteristics} follows {@link #CHARACTERISTICS}. */
    static void appendRow(StringBuilder row, String date, String security, double periodReturn, double marketCap,
                          double[] characteristics, String sector, String tier) {
        if (characteristics.length != CHARACTERISTICS.size()) {
            throw new IllegalArgumentException("expected " + CHARACTERISTICS.size() + " characteristics, got " + characteristics.length);
        }
        row.append(date).append(',').append(security).append(',');
        appendNumber(row, periodReturn);
        row.append(',');
        appendNumber(row, marketCap);
        for (double value : characteristics) {
            row.append(',');
            appendNumber(row, value);
        }
        row.append(',').append(sector).append(',').append(tier).append('\n');
    }

    /** Appends one row of the seven-column layout {@link SyntheticPanelWriter#NARROW_HEADER}, newline included. */
    static void appendNarrowRow(StringBuilder row, String date, String security, double periodReturn, double marketCap,
                                double bookToPrice, double momentum, String sector) {
        row.append(date).append(',').append(security).append(',');
        appendNumber(row, periodReturn);
        row.append(',');
        appendNumber(row, marketCap);
        row.append(',');
        appendNumber(row, bookToPrice);
        row.append(',');
        appendNumber(row, momentum);
        row.append(',').append(sector).append('\n');
    }

    static void appendNumber(StringBuilder row, double value) {
        SignificantDigits.append(row, value, SIGNIFICANT_DIGITS);
    }

    /** A buffered UTF-8 writer on {@code file}, gzip-compressed when the name ends with ".gz". */
    static Writer openWriter(Path file) throws IOException {
        Path parent = file.toAbsolutePath().getParent();
        if (parent != null) {
            Files.createDirectories(parent);
        }
        OutputStream out = new BufferedOutputStream(Files.newOutputStream(file), 1 << 16);
        if (file.getFileName().toString().endsWith(".gz")) {
            out = new GZIPOutputStream(out, 1 << 16);
        }
        return new BufferedWriter(new OutputStreamWriter(out, StandardCharsets.UTF_8), 1 << 20);
    }
}
