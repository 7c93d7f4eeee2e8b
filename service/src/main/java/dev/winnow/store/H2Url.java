package dev.winnow.store;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * What durability needs from an H2 JDBC URL, however the operator spelled it. H2 writes a commit to its file up to
 * {@code WRITE_DELAY} ms (default 500) after acknowledging it, so a killed process could lose an upload that was
 * already answered 202: every H2 URL gets {@code WRITE_DELAY=0}, and a URL that asks for anything that loses
 * committed data (another write delay, {@code LOG=0}, an in-memory database) is refused with a message saying what
 * to change. URLs of other databases pass unchanged.
 */
public final class H2Url {
    private static final String PREFIX = "jdbc:h2:";

    private H2Url() {
    }

    public static boolean isH2(String url) {
        return url.regionMatches(true, 0, PREFIX, 0, PREFIX.length());
    }

    /** The store file of an embedded H2 file URL ({@code name.mv.db}), or empty for other URLs. */
    public static java.util.Optional<java.nio.file.Path> storeFile(String url) {
        if (!isH2(url)) {
            return java.util.Optional.empty();
        }
        String location = url.split(";", 2)[0].substring(PREFIX.length());
        if (location.regionMatches(true, 0, "file:", 0, 5)) {
            location = location.substring(5);
        } else if (location.contains(":") && !location.matches("^[A-Za-z]:[\\\\/].*")) {
            return java.util.Optional.empty(); // tcp:, ssl:, mem:, zip: ...
        }
        return java.util.Optional.of(java.nio.file.Path.of(location + ".mv.db"));
    }

    /** The URL with WRITE_DELAY=0; throws IllegalArgumentException naming the setting to change. */
    public static String durable(String url) {
        if (!isH2(url)) {
            return url;
        }
        String[] parts = url.split(";", -1);
        String location = parts[0].substring(PREFIX.length());
        if (location.toLowerCase(Locale.ROOT).startsWith("mem:")) {
            throw new IllegalArgumentException("WINNOW_DB_URL '" + url + "' is an in-memory database, which loses every "
                    + "acknowledged upload when the process stops; use a file URL such as jdbc:h2:file:/srv/winnow/store");
        }
        List<String> settings = new ArrayList<>();
        boolean hasWriteDelay = false;
        for (int i = 1; i < parts.length; i++) {
            String setting = parts[i].trim();
            if (setting.isEmpty()) {
                continue;
            }
            int eq = setting.indexOf('=');
            String key = (eq < 0 ? setting : setting.substring(0, eq)).trim().toUpperCase(Locale.ROOT);
            String value = eq < 0 ? "" : setting.substring(eq + 1).trim();
            if (key.equals("WRITE_DELAY")) {
                if (!value.equals("0")) {
                    throw new IllegalArgumentException("WINNOW_DB_URL sets WRITE_DELAY=" + value + ", which lets a crash lose "
                            + "commits already acknowledged; remove the setting (Winnow sets WRITE_DELAY=0) or set it to 0");
                }
                hasWriteDelay = true;
            } else if (key.equals("LOG") && value.equals("0")) {
                throw new IllegalArgumentException("WINNOW_DB_URL sets LOG=0, which turns off the transaction log so a "
                        + "crash can lose or corrupt committed data; remove the setting");
            }
            settings.add(setting);
        }
        if (!hasWriteDelay) {
            settings.add("WRITE_DELAY=0");
        }
        return parts[0] + ";" + String.join(";", settings);
    }
}
