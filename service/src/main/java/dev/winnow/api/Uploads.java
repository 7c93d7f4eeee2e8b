package dev.winnow.api;

import dev.winnow.ingest.UploadMode;
import dev.winnow.ingest.UploadSpool;
import io.javalin.http.Context;

import java.io.IOException;
import java.io.InputStream;
import java.util.List;

/** Checks an upload request's headers and spools its body to disk. */
final class Uploads {
    /**
     * How much of a refused upload's body is read and discarded before the problem is answered. A server that answers
     * and closes while the client is still sending makes the client's kernel see unread data in a closed socket: it
     * answers with a reset, and the client may lose the answer it had not yet read (RFC 9112 section 9.6 advises
     * reading on before closing for this reason). A body declared longer than this is not read: the answer is sent
     * and the connection closed.
     */
    static final long DISCARD_LIMIT = 8L << 20;

    private Uploads() {
    }

    /**
     * Checks the headers and spools the body; when the upload is refused (a wrong media type or mode, past the size
     * limit, no room on the disk), reads the rest of a body of at most {@link #DISCARD_LIMIT} bytes before the
     * refusal propagates, so that the client reads the problem instead of a reset connection.
     */
    static Received receive(Context ctx, UploadSpool spool) {
        try {
            return spool(ctx, spool);
        } catch (RuntimeException refused) {
            discardRest(ctx);
            throw refused;
        }
    }

    /** Reads and drops what is left of the request body when its declared length (or, when chunked, its rest) is small. */
    static void discardRest(Context ctx) {
        long declared = ctx.req().getContentLengthLong();
        if (declared > DISCARD_LIMIT) {
            return;
        }
        try {
            InputStream body = ctx.req().getInputStream();
            byte[] buffer = new byte[64 * 1024];
            long read = 0;
            int n;
            while (read <= DISCARD_LIMIT && (n = body.read(buffer)) >= 0) {
                read += n;
            }
        } catch (IOException | RuntimeException gone) {
            // the client went away or the body was already consumed: nothing more to read
        }
    }

    /** A spooled upload body: where it is, whether it is gzip-compressed, and how to apply it. */
    record Received(String spoolPath, boolean gzip, UploadMode mode) {
    }

    private static Received spool(Context ctx, UploadSpool spool) {
        String contentType = ctx.contentType();
        if (contentType == null || !Json.mediaType(contentType).equals("text/csv")) {
            throw new ApiProblem(415, "Unsupported media type", "Send the upload as 'Content-Type: text/csv' (RFC 4180, UTF-8, header row); got "
                    + (contentType == null ? "no Content-Type" : "'" + contentType + "'") + ".");
        }
        String encoding = ctx.header("Content-Encoding");
        boolean gzip = false;
        if (encoding != null && !encoding.isBlank() && !encoding.equalsIgnoreCase("identity")) {
            if (!encoding.trim().equalsIgnoreCase("gzip")) {
                throw new ApiProblem(415, "Unsupported media type", "Content-Encoding '" + encoding + "' is not supported; send gzip or no encoding.");
            }
            gzip = true;
        }
        String mode = Requests.choiceParam(ctx, "mode", List.of("append", "revise"), "append");
        UploadSpool.Spooled spooled;
        try {
            spooled = spool.write(ctx.bodyInputStream(), ctx.req().getContentLengthLong(), gzip);
        } catch (IOException e) {
            throw ApiProblem.badRequest("The upload body could not be read to its end (the connection broke off); nothing was stored. Send it again.");
        }
        if (spooled.size() == 0) {
            spool.delete(spooled.relativePath());
            throw ApiProblem.badRequest("The upload body is empty; send a CSV with a header row and at least one data row.");
        }
        return new Received(spooled.relativePath(), gzip, UploadMode.fromWire(mode));
    }
}
