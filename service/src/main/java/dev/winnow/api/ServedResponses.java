package dev.winnow.api;

import io.javalin.http.Context;
import jakarta.servlet.ServletOutputStream;
import org.eclipse.jetty.ee10.servlet.HttpOutput;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.Supplier;
import java.util.zip.GZIPOutputStream;

/**
 * Encoded answers of the read endpoints, kept in memory and served again as the same bytes.
 *
 * <p>An answer is keyed by its <em>data key</em> (every input series' factor id, version and data version, read
 * from the in-memory catalog that the change feed keeps current) plus the path, the query and the format. A change
 * to any input bumps its data version, so the next request builds a different key and a new answer; an entry of an
 * old key is never looked up again and ages out. There is no time-based expiry, and nothing to invalidate by hand:
 * correctness rests on the catalog being current, which {@link dev.winnow.store.ChangeFeed} guarantees.
 *
 * <p>The cache holds at most {@link #CAPACITY_BYTES} of bodies (gzip variants included); past that, the least
 * recently used entries are dropped down to three quarters of it. Bodies of at least {@link #GZIP_MIN_BYTES} are sent
 * gzip-compressed to clients that accept it, compressed once per entry.
 */
final class ServedResponses {
    private static final Logger LOG = LoggerFactory.getLogger(ServedResponses.class);
    static final long CAPACITY_BYTES = 96L << 20;
    static final int GZIP_MIN_BYTES = 1024;

    /** An encoded answer: its body and content type. */
    record Encoded(byte[] body, String contentType) {
    }

    private static final class Entry {
        final byte[] body;
        final String contentType;
        final String etag;
        volatile byte[] gzip;
        volatile long lastUsed;

        Entry(byte[] body, String contentType, String etag) {
            this.body = body;
            this.contentType = contentType;
            this.etag = etag;
        }

        long size() {
            byte[] g = gzip;
            return body.length + (g == null ? 0 : g.length) + 128L;
        }
    }

    private final Map<String, Entry> entries = new ConcurrentHashMap<>();
    private final AtomicLong bytes = new AtomicLong();
    private final AtomicLong clock = new AtomicLong();
    private final AtomicLong hits = new AtomicLong();
    private final AtomicLong misses = new AtomicLong();

    /**
     * Answers from memory when the same request over the same data was answered before; else calls
     * {@code producer} (which may throw an {@link ApiProblem}: nothing is kept then), keeps and sends its bytes.
     * Sets the ETag and answers 304 when {@code If-None-Match} holds it.
     *
     * @param dataKey names every input series and its data version
     */
    void respond(Context ctx, String dataKey, boolean csv, Supplier<Encoded> producer) {
        String query = ctx.queryString();
        String key = dataKey + '|' + ctx.path() + '?' + (query == null ? "" : query) + (csv ? "#csv" : "#json");
        Entry entry = entries.get(key);
        String etag = entry != null ? entry.etag : Responses.etag(dataKey, ctx, csv);
        ctx.header("ETag", etag);
        ctx.header("Vary", "Accept-Encoding");
        if (Responses.matches(ctx, etag)) {
            ctx.status(304);
            return;
        }
        if (entry == null) {
            misses.incrementAndGet();
            Encoded encoded = producer.get();
            entry = new Entry(encoded.body(), encoded.contentType(), etag);
            Entry raced = entries.putIfAbsent(key, entry);
            if (raced == null) {
                grow(entry.size());
            } else {
                entry = raced;
            }
        } else {
            hits.incrementAndGet();
        }
        entry.lastUsed = clock.incrementAndGet();
        byte[] body = entry.body;
        if (body.length >= GZIP_MIN_BYTES && acceptsGzip(ctx.header("Accept-Encoding"))) {
            body = gzipOf(entry);
            ctx.header("Content-Encoding", "gzip");
        }
        ctx.status(200).contentType(entry.contentType);
        write(ctx, body);
    }

    /**
     * Writes the bytes straight to the servlet response with their length, in one call: Javalin's result pipeline
     * would copy them through its compressing stream in small chunks, and Jetty's {@code sendContent} hands the
     * whole buffer to the connection without its aggregation buffer. A client that went away gets nothing more.
     */
    private static void write(Context ctx, byte[] body) {
        try {
            ctx.res().setContentLength(body.length);
            ServletOutputStream out = ctx.res().getOutputStream();
            if (out instanceof HttpOutput jetty) {
                jetty.sendContent(ByteBuffer.wrap(body));
            } else {
                out.write(body);
            }
        } catch (IOException e) {
            LOG.debug("client went away while {} was written: {}", ctx.path(), e.toString());
        }
    }

    long hits() {
        return hits.get();
    }

    long misses() {
        return misses.get();
    }

    private byte[] gzipOf(Entry entry) {
        byte[] g = entry.gzip;
        if (g == null) {
            g = gzip(entry.body);
            entry.gzip = g;
            grow(g.length);
        }
        return g;
    }

    private void grow(long by) {
        if (bytes.addAndGet(by) > CAPACITY_BYTES) {
            evict();
        }
    }

    /** Drops the least recently used entries until three quarters of the capacity remain. */
    private synchronized void evict() {
        if (bytes.get() <= CAPACITY_BYTES) {
            return;
        }
        List<Map.Entry<String, Entry>> all = new ArrayList<>(entries.entrySet());
        all.sort((a, b) -> Long.compare(a.getValue().lastUsed, b.getValue().lastUsed));
        for (Map.Entry<String, Entry> e : all) {
            if (bytes.get() <= CAPACITY_BYTES * 3 / 4) {
                break;
            }
            if (entries.remove(e.getKey(), e.getValue())) {
                bytes.addAndGet(-e.getValue().size());
            }
        }
    }

    /** True when the Accept-Encoding header lists gzip (or *) without q=0 (RFC 9110, section 12.5.3). */
    static boolean acceptsGzip(String header) {
        if (header == null) {
            return false;
        }
        for (String part : header.split(",")) {
            String[] pieces = part.split(";");
            String coding = pieces[0].trim().toLowerCase(Locale.ROOT);
            if (!coding.equals("gzip") && !coding.equals("*") && !coding.equals("x-gzip")) {
                continue;
            }
            boolean refused = false;
            for (int i = 1; i < pieces.length; i++) {
                String p = pieces[i].trim().toLowerCase(Locale.ROOT);
                if (p.startsWith("q=")) {
                    try {
                        refused = Double.parseDouble(p.substring(2).trim()) <= 0.0;
                    } catch (NumberFormatException e) {
                        refused = true;
                    }
                }
            }
            if (!refused) {
                return true;
            }
        }
        return false;
    }

    private static byte[] gzip(byte[] body) {
        ByteArrayOutputStream out = new ByteArrayOutputStream(Math.max(64, body.length / 4));
        try (GZIPOutputStream gz = new GZIPOutputStream(out, 8192)) {
            gz.write(body);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return out.toByteArray();
    }
}
