package dev.winnow.api;

import org.eclipse.jetty.http.HttpFields;
import org.eclipse.jetty.http.HttpHeader;
import org.eclipse.jetty.server.Request;
import org.eclipse.jetty.server.Response;
import org.eclipse.jetty.server.handler.ErrorHandler;
import org.eclipse.jetty.util.Callback;

import java.nio.ByteBuffer;

/**
 * Jetty's own error answers (a request it refuses before Javalin sees it: a path or header too long, a broken
 * percent escape, a NUL in the path) as {@code application/problem+json} instead of Jetty's HTML page.
 */
final class ProblemErrorHandler extends ErrorHandler {
    private static final int MAX_SHOWN_PATH = 100;

    @Override
    protected void generateResponse(Request request, Response response, int code, String message, Throwable cause,
                                    Callback callback) {
        String path = request.getHttpURI() == null ? null : request.getHttpURI().getPath();
        response.getHeaders().put(HttpHeader.CONTENT_TYPE, ApiServer.PROBLEM_JSON);
        response.write(true, ByteBuffer.wrap(body(code, message, path)), callback);
    }

    @Override
    public ByteBuffer badMessageError(int status, String reason, HttpFields.Mutable fields) {
        fields.put(HttpHeader.CONTENT_TYPE, ApiServer.PROBLEM_JSON);
        return ByteBuffer.wrap(body(status, reason, null));
    }

    static byte[] body(int status, String reason, String path) {
        String instance = path == null ? "/" : path.length() > MAX_SHOWN_PATH ? path.substring(0, MAX_SHOWN_PATH) + "..." : path;
        return Json.write(ApiProblem.Body.of(title(status), status, detail(status, reason), instance, java.util.List.of()))
                .getBytes(java.nio.charset.StandardCharsets.UTF_8);
    }

    private static String title(int status) {
        return switch (status) {
            case 400 -> "Bad request";
            case 404 -> "Not found";
            case 405 -> "Method not allowed";
            case 413 -> "Content too large";
            case 414 -> "URI too long";
            case 431 -> "Request header fields too large";
            case 500 -> "Internal server error";
            case 503 -> "Service unavailable";
            default -> "HTTP " + status;
        };
    }

    private static String detail(int status, String reason) {
        return switch (status) {
            case 414 -> "The request's path and query are longer than the server accepts (8 KB); shorten them, for "
                    + "example by naming fewer factors per request.";
            case 431 -> "The request's headers are larger than the server accepts (8 KB); send fewer or shorter headers.";
            case 400 -> "The request could not be read" + (reason == null || reason.isBlank() ? "" : " (" + reason + ")")
                    + ": check the path for broken percent escapes (% must be followed by two hex digits) or "
                    + "control characters such as %00.";
            case 500 -> "The server failed while handling this request; the error was logged.";
            default -> reason == null || reason.isBlank() ? "The request could not be handled." : reason;
        };
    }
}
