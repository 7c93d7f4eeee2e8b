package dev.winnow.api;

import java.util.List;
import java.util.Map;

/**
 * A client error to be answered as {@code application/problem+json} (RFC 9457). {@code detail} tells the caller what to fix.
 */
public final class ApiProblem extends RuntimeException {
    private final int status;
    private final String title;
    private final List<Map<String, Object>> errors;

    public ApiProblem(int status, String title, String detail) {
        this(status, title, detail, List.of());
    }

    public ApiProblem(int status, String title, String detail, List<Map<String, Object>> errors) {
        super(detail);
        this.status = status;
        this.title = title;
        this.errors = errors;
    }

    public static ApiProblem badRequest(String detail) {
        return new ApiProblem(400, "Bad request", detail);
    }

    public static ApiProblem notFound(String detail) {
        return new ApiProblem(404, "Not found", detail);
    }

    public int status() {
        return status;
    }

    public String title() {
        return title;
    }

    public String detail() {
        return getMessage();
    }

    public List<Map<String, Object>> errors() {
        return errors;
    }
}
