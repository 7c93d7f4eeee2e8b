package dev.winnow.api;

import dev.winnow.ingest.JobQueue;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobStore;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.PanelStore;
import dev.winnow.store.TokenStore;
import io.javalin.Javalin;
import io.javalin.http.Context;
import io.javalin.http.HttpResponseException;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.LinkedHashMap;
import java.util.Map;

/** The HTTP API: every route, the auth check and the error mapping, configured in one upfront block. */
public final class ApiServer {
    private static final Logger LOG = LoggerFactory.getLogger(ApiServer.class);
    static final String PROBLEM_JSON = "application/problem+json";

    /** What the handlers need. */
    public record Dependencies(TokenStore tokens, JobStore jobs, PanelStore panels, FactorStore factors,
                               LoadingsStore loadings, JobQueue queue, UploadSpool spool) {
    }

    private ApiServer() {
    }

    public static Javalin create(Dependencies d, String host, int port) {
        return create(d, host, port, true);
    }

    /**
     * The HTTP server; with {@code servesApi} false (a worker instance) only {@code /health} and {@code /metrics}
     * answer, everything else is a 404 saying so.
     */
    public static Javalin create(Dependencies d, String host, int port, boolean servesApi) {
        Authenticator auth = new Authenticator(d.tokens());
        TokenRoutes tokens = new TokenRoutes(d.tokens(), auth);
        JobRoutes jobs = new JobRoutes(d.jobs());
        PanelRoutes panels = new PanelRoutes(d.panels(), d.queue(), d.spool());
        FactorRoutes factors = new FactorRoutes(d.factors(), d.panels(), d.queue(), d.spool());
        AnalyticsRoutes analytics = new AnalyticsRoutes(d.factors());
        EvidenceRoutes evidence = new EvidenceRoutes(d.factors(), d.panels());
        LoadingsRoutes loadings = new LoadingsRoutes(d.panels(), d.factors(), d.loadings(), d.queue());

        return Javalin.create(config -> {
            config.jetty.host = host;
            config.jetty.port = port;
            config.startup.showJavalinBanner = false;
            config.http.maxRequestSize = 1_000_000;
            config.http.prefer405over404 = true;

            if (!servesApi) {
                config.routes.before(ctx -> {
                    if (!ctx.path().equals("/health") && !ctx.path().equals("/metrics")) {
                        throw new ApiProblem(404, "Not found", "This instance only runs jobs (WINNOW_ROLE=worker); "
                                + "send API requests to an instance with WINNOW_ROLE api or all.");
                    }
                });
            }
            config.routes.before(auth::check);
            config.routes.get("/health", ctx -> Json.respond(ctx, Map.of("status", "ok")));

            config.routes.post("/v1/tokens", tokens::create);
            config.routes.get("/v1/tokens", tokens::list);
            config.routes.delete("/v1/tokens/{name}", tokens::revoke);

            config.routes.get("/v1/jobs/{id}", jobs::get);

            config.routes.post("/v1/panels/{panel}/uploads", panels::upload);
            config.routes.get("/v1/panels", panels::list);
            config.routes.get("/v1/panels/{panel}", panels::get);

            config.routes.put("/v1/factors/{factor}", factors::define);
            config.routes.get("/v1/factors", factors::list);
            config.routes.get("/v1/factors/{factor}", factors::get);
            config.routes.delete("/v1/factors/{factor}", factors::retire);
            config.routes.post("/v1/factors/{factor}/uploads", factors::uploadSeries);
            config.routes.get("/v1/factors/{factor}/returns", factors::returns);
            config.routes.get("/v1/factors/{factor}/turnover", factors::turnover);
            config.routes.get("/v1/factors/{factor}/summary", analytics::summary);
            config.routes.get("/v1/factors/{factor}/drawdowns", analytics::drawdowns);
            config.routes.get("/v1/factors/{factor}/significance", analytics::significance);
            config.routes.get("/v1/correlations", analytics::correlations);
            config.routes.get("/v1/correlations/rolling", analytics::rollingCorrelation);
            config.routes.get("/v1/evidence", evidence::table);
            config.routes.get("/v1/factors/{factor}/evidence", evidence::factor);
            config.routes.get("/v1/themes", evidence::themes);
            config.routes.get("/v1/themes/{theme}/returns", evidence::themeReturns);

            config.routes.get("/v1/loadings", loadings::get);
            config.routes.get("/v1/loadings/{security}", loadings::securityHistory);
            config.routes.post("/v1/exposures", loadings::exposures);
            config.routes.put("/v1/panels/{panel}/loadings-config", loadings::putConfig);
            config.routes.get("/v1/panels/{panel}/loadings-config", loadings::getConfig);
            config.routes.post("/v1/panels/{panel}/loadings-config/history", loadings::history);

            config.routes.exception(ApiProblem.class, (e, ctx) -> problem(ctx, e.status(), e.title(), e.detail(), e.errors()));
            config.routes.exception(HttpResponseException.class, (e, ctx) -> problem(ctx, e.getStatus(), titleOf(e.getStatus()),
                    detailOf(e, ctx), java.util.List.of()));
            config.routes.exception(Exception.class, (e, ctx) -> {
                LOG.error("unexpected error on {} {}", ctx.method(), ctx.path(), e);
                problem(ctx, 500, "Internal server error", "The server failed while handling this request; the error was logged. "
                        + "Nothing was changed by it unless a job id was returned.", java.util.List.of());
            });
            config.routes.error(404, ctx -> {
                if (!isProblem(ctx)) {
                    problem(ctx, 404, "Not found", "No endpoint " + ctx.method() + " " + ctx.path() + "; see openapi.yaml for the API.", java.util.List.of());
                }
            });
            config.routes.error(405, ctx -> {
                if (!isProblem(ctx)) {
                    problem(ctx, 405, "Method not allowed", "Method " + ctx.method() + " is not allowed on " + ctx.path() + ".", java.util.List.of());
                }
            });
        });
    }

    private static boolean isProblem(Context ctx) {
        String type = ctx.res().getContentType();
        return type != null && type.startsWith(PROBLEM_JSON);
    }

    private static String titleOf(int status) {
        return switch (status) {
            case 400 -> "Bad request";
            case 401 -> "Unauthorized";
            case 403 -> "Forbidden";
            case 404 -> "Not found";
            case 405 -> "Method not allowed";
            case 413 -> "Content too large";
            case 415 -> "Unsupported media type";
            default -> "HTTP " + status;
        };
    }

    private static String detailOf(HttpResponseException e, Context ctx) {
        if (e.getStatus() == 413) {
            return "The request body is too large for this endpoint; JSON bodies are limited to 1 MB.";
        }
        if (e.getStatus() == 404) {
            return "No endpoint " + ctx.method() + " " + ctx.path() + "; see openapi.yaml for the API.";
        }
        return e.getMessage();
    }

    static void problem(Context ctx, int status, String title, String detail, java.util.List<Map<String, Object>> errors) {
        Map<String, Object> body = new LinkedHashMap<>();
        body.put("type", "about:blank");
        body.put("title", title);
        body.put("status", status);
        body.put("detail", detail);
        body.put("instance", ctx.path());
        if (!errors.isEmpty()) {
            body.put("errors", errors);
        }
        Json.respond(ctx, status, body);
        ctx.contentType(PROBLEM_JSON);
    }

}
