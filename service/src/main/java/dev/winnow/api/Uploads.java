package dev.winnow.api;

import dev.winnow.ingest.UploadMode;
import dev.winnow.ingest.UploadSpool;
import io.javalin.http.Context;

import java.io.IOException;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Locale;

/** Checks an upload request's headers and spools its body to disk. */
final class Uploads {
    private Uploads() {
    }

    /** A spooled upload body: where it is, whether it is gzip-compressed, and how to apply it. */
    record Received(String spoolPath, boolean gzip, UploadMode mode) {
    }

    static Received receive(Context ctx, UploadSpool spool) {
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
