package dev.winnow.app.seed;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.zip.GZIPInputStream;

/** Finds the committed top-level {@code seed-data} folder from the test's working directory and reads its files. */
public final class SeedDataFolder {

    private SeedDataFolder() {
    }

    public static Path locate() {
        Path dir = Path.of("").toAbsolutePath();
        while (dir != null) {
            Path candidate = dir.resolve("seed-data");
            if (Files.isRegularFile(candidate.resolve("factors.json"))) {
                return candidate;
            }
            dir = dir.getParent();
        }
        throw new IllegalStateException("no seed-data folder with factors.json above " + Path.of("").toAbsolutePath());
    }

    /** An input stream over the file's content, decompressed when the name ends with ".gz". */
    static InputStream openContent(Path file) throws IOException {
        InputStream in = Files.newInputStream(file);
        return file.getFileName().toString().endsWith(".gz") ? new GZIPInputStream(in, 1 << 16) : in;
    }

    /** SHA-256 of the uncompressed content, so a gzip level or zlib version cannot change the answer. */
    static String contentSha256(Path file) throws IOException {
        try (InputStream in = openContent(file)) {
            MessageDigest digest = MessageDigest.getInstance("SHA-256");
            byte[] buffer = new byte[1 << 16];
            for (int n = in.read(buffer); n >= 0; n = in.read(buffer)) {
                digest.update(buffer, 0, n);
            }
            return HexFormat.of().formatHex(digest.digest());
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every JDK has SHA-256", e);
        }
    }
}
