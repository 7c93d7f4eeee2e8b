package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.GZIPOutputStream;

/** Test helpers: upload files in a temp directory, a collecting sink, and security ids that force sorting. */
final class UploadFixtures {

    private UploadFixtures() {
    }

    static Path write(Path dir, String text) {
        return writeBytes(dir, text.getBytes(StandardCharsets.UTF_8), false);
    }

    /** Compressed with the JDK's gzip writer, independent of the parser's reading side. */
    static Path writeGzip(Path dir, String text) {
        return writeBytes(dir, text.getBytes(StandardCharsets.UTF_8), true);
    }

    static Path writeBytes(Path dir, byte[] bytes, boolean gzip) {
        try {
            Path file = Files.createTempFile(dir, "upload", gzip ? ".csv.gz" : ".csv");
            try (OutputStream out = gzip ? new GZIPOutputStream(Files.newOutputStream(file)) : Files.newOutputStream(file)) {
                out.write(bytes);
            }
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Collects what the parser sends. */
    static class CollectingSink implements CrossSectionSink {
        final List<CrossSection> received = new ArrayList<>();

        @Override
        public void accept(CrossSection crossSection) {
            received.add(crossSection);
        }

        @Override
        public void discardAccepted() {
            received.clear();
        }
    }

    /** Hands out decreasing ids in order of first request, so file order never equals id order. */
    static final class DecreasingIds implements SecurityIds {
        final Map<String, Integer> ids = new HashMap<>();
        int calls;

        @Override
        public int idFor(String code) {
            calls++;
            return ids.computeIfAbsent(code, c -> 1_000 - 7 * ids.size());
        }

        String codeOf(int id) {
            return ids.entrySet().stream().filter(e -> e.getValue() == id).findFirst().orElseThrow().getKey();
        }
    }
}
