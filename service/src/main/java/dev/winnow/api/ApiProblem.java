package dev.winnow.api;

import java.util.List;
import java.util.Map;

/**
 * A client error to be answered as {@code application/problem+json} (RFC 9457). {@code detail} tells the caller what to fix.
 */
public final class ApiProblem extends RuntimeException {
    /**
     * The body of every problem answer (RFC 9457): {@code type} is always {@code about:blank}, {@code instance} the
     * request's path; {@code errors} (one {@code {"message": ...}} per problem found) only when there is a list.
     */
    record Body(String type, String title, int status, String detail, String instance,
                @com.fasterxml.jackson.annotation.JsonInclude(com.fasterxml.jackson.annotation.JsonInclude.Include.NON_EMPTY)
                List<Map<String, Object>> errors) {
        static Body of(String title, int status, String detail, String instance, List<Map<String, Object>> errors) {
            return new Body("about:blank", title, status, detail, instance, errors);
        }
    }

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
