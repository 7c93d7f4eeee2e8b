package dev.winnow.api;

import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobParams;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.Breadth;
import dev.winnow.research.ConflictException;
import dev.winnow.research.FactorDefinitions;
import dev.winnow.research.FactorEvidence;
import dev.winnow.research.FactorPortfolios;
import dev.winnow.research.Families;
import dev.winnow.research.FactorHoldings;
import dev.winnow.research.FamaMacBethStudy;
import dev.winnow.research.InformationCoefficients;
import dev.winnow.research.ModelTests;
import dev.winnow.research.FactorLibrary;
import dev.winnow.research.InvalidRequestException;
import dev.winnow.research.NameKind;
import dev.winnow.research.PortfolioRiskStudy;
import dev.winnow.research.LoadingsService;
import dev.winnow.research.SignalPreview;
import dev.winnow.research.Themes;
import dev.winnow.research.TrialLibrary;
import dev.winnow.research.UnknownNameException;
import dev.winnow.stats.InsufficientDataException;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobStore;
import dev.winnow.store.PanelStore;
import dev.winnow.store.StorageFaultLog;
import dev.winnow.store.StorageFaults;
import dev.winnow.store.TokenStore;
import io.javalin.Javalin;
import io.javalin.config.JavalinConfig;
import io.javalin.http.Context;
import io.javalin.http.HttpResponseException;
import org.eclipse.jetty.server.HttpConnectionFactory;
import org.eclipse.jetty.server.ServerConnector;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.Map;

/** The HTTP API: every route, the auth check and the error mapping, configured in one upfront block. */
public final class ApiServer {
    private static final Logger LOG = LoggerFactory.getLogger(ApiServer.class);
    static final String PROBLEM_JSON = "application/problem+json";
    /** Jetty's read buffer per connection: how many bytes of a request body one socket read can take. */
    private static final int INPUT_BUFFER_BYTES = 64 * 1024;

    /** What the handlers need, each wired once by the application. */
    public record Dependencies(TokenStore tokens, JobStore jobs, PanelStore panels, FactorStore factors, JobQueue queue,
                               UploadSpool spool, FactorDefinitions definitions, TrialLibrary library, FactorEvidence evidence,
                               Breadth breadth, Themes themes, LoadingsService loadings, SignalPreview signals,
                               FamaMacBethStudy famaMacBeth, ModelTests modelTests, FactorPortfolios portfolios,
                               InformationCoefficients informationCoefficients,
                               Health.Check health, FactorHoldings holdings, Families families,
                               FactorLibrary factorLibrary, PortfolioRiskStudy portfolioRisk) {
    }

    private ApiServer() {
    }

    /**
     * What this instance serves: the API or (a worker instance) only {@code /health} and {@code /metrics}; the
     * metrics registry requests are timed into and its scrape; whether {@code /metrics} needs no token.
     */
    public record Serving(boolean servesApi, io.micrometer.core.instrument.MeterRegistry metrics,
                          java.util.function.Supplier<String> scrape, boolean metricsPublic) {
    }

    /**
     * The HTTP server; with {@code servesApi} false only {@code /health} and {@code /metrics} answer, everything
     * else is a 404 saying so.
     */
    public static Javalin create(Dependencies d, String host, int port, Serving serving) {
        boolean servesApi = serving.servesApi();
        MetricsEndpoint metrics = new MetricsEndpoint(serving.metrics(), serving.scrape());
        Authenticator auth = new Authenticator(d.tokens());
        TokenRoutes tokens = new TokenRoutes(d.tokens());
        JobRoutes jobs = new JobRoutes(d.jobs());
        PanelRoutes panels = new PanelRoutes(d.panels(), d.queue(), d.spool());
        ServedResponses served = new ServedResponses();
        metrics.watch(served);
        FactorRoutes factors = new FactorRoutes(d.factors(), d.definitions(), d.queue(), d.spool(), served);
        AnalyticsRoutes analytics = new AnalyticsRoutes(d.factors(), served);
        LibraryRoutes library = new LibraryRoutes(d.factorLibrary(), d.portfolioRisk(), d.panels(), served);
        ChartRoutes charts = new ChartRoutes(d.factors(), d.portfolios(), d.informationCoefficients());
        PageRoutes page = new PageRoutes();
        EvidenceRoutes evidence = new EvidenceRoutes(d.factors(), d.library(), d.evidence(), d.breadth(), d.themes());
        LoadingsRoutes loadings = new LoadingsRoutes(d.panels(), d.loadings());
        SignalRoutes signals = new SignalRoutes(d.signals());
        HoldingsRoutes holdings = new HoldingsRoutes(d.factors(), d.holdings());
        FamilyRoutes families = new FamilyRoutes(d.families());
        CrossSectionRoutes crossSection = new CrossSectionRoutes(d.factors(), d.famaMacBeth(), d.modelTests(), d.portfolios(),
                d.informationCoefficients(), served);

        return Javalin.create(config -> {
            // one connector of our own instead of Javalin's default, for its read buffer: Jetty reads a request body
            // from the socket at most one input buffer (8 KiB by default) per system call, and a 1.4 GB panel upload
            // then costs 175,000 reads; 64 KiB cuts them eightfold (the buffer is pooled, held while a read is pending)
            config.jetty.addConnector((server, http) -> {
                HttpConnectionFactory factory = new HttpConnectionFactory(http);
                factory.setInputBufferSize(INPUT_BUFFER_BYTES);
                ServerConnector connector = new ServerConnector(server, factory);
                connector.setHost(host);
                connector.setPort(port);
                return connector;
            });
            config.startup.showJavalinBanner = false;
            config.http.maxRequestSize = 1_000_000;
            config.http.prefer405over404 = true;
            config.requestLogger.http(metrics::record);

            ProblemErrorHandler jettyErrors = new ProblemErrorHandler();
            config.jetty.modifyServer(server -> server.setErrorHandler(jettyErrors));
            config.jetty.modifyServletContextHandler(handler -> handler.setErrorHandler(jettyErrors));
            config.routes.before(Requests::checkQueryEscapes);
            if (!servesApi) {
                config.routes.before(ctx -> {
                    if (!ctx.path().equals("/health") && !ctx.path().equals("/metrics")) {
                        throw new ApiProblem(404, "Not found", "This instance only runs jobs (WINNOW_ROLE=worker); "
                                + "send API requests to an instance with WINNOW_ROLE api or all.");
                    }
                });
            }
            config.routes.before(ctx -> {
                if (!(serving.metricsPublic() && ctx.path().equals("/metrics"))) {
                    auth.check(ctx);
                }
            });
            config.routes.get("/metrics", metrics::scrape);
            config.routes.get("/health", ctx -> {
                Health health = d.health().now();
                Json.respond(ctx, health.serving() ? 200 : 503, health);
            });
            config.routes.get("/", page::page);
            config.routes.get("/ui/{file}", page::asset);

            config.routes.post("/v1/admin/compact", ctx -> Accepted.job(ctx, d.queue().enqueue(new JobParams.CompactStore())));
            config.routes.post("/v1/tokens", tokens::create);
            config.routes.get("/v1/tokens", tokens::list);
            config.routes.delete("/v1/tokens/{name}", tokens::revoke);

            config.routes.get("/v1/jobs/{id}", jobs::get);

            config.routes.post("/v1/panels/{panel}/uploads", panels::upload);
            config.routes.get("/v1/panels", panels::list);
            config.routes.get("/v1/panels/{panel}", panels::get);
            config.routes.get("/v1/panels/{panel}/signals", signals::values);

            config.routes.put("/v1/factors/{factor}", factors::define);
            config.routes.get("/v1/factors", factors::list);
            config.routes.get("/v1/factors/{factor}", factors::get);
            config.routes.delete("/v1/factors/{factor}", factors::retire);
            config.routes.post("/v1/factors/{factor}/uploads", factors::uploadSeries);
            config.routes.get("/v1/factors/{factor}/returns", factors::returns);
            config.routes.get("/v1/factors/{factor}/turnover", factors::turnover);
            config.routes.get("/v1/factors/{factor}/holdings", holdings::get);
            config.routes.put("/v1/families/{family}", families::declare);
            config.routes.get("/v1/families", families::list);
            config.routes.get("/v1/families/{family}", families::get);
            config.routes.delete("/v1/families/{family}", families::delete);
            config.routes.get("/v1/factors/{factor}/summary", analytics::summary);
            config.routes.get("/v1/factors/{factor}/drawdowns", analytics::drawdowns);
            config.routes.get("/v1/factors/{factor}/significance", analytics::significance);
            config.routes.get("/v1/correlations", analytics::correlations);
            config.routes.get("/v1/returns", library::returns);
            config.routes.get("/v1/covariance", library::covariance);
            config.routes.get("/v1/correlations/rolling", analytics::rollingCorrelation);
            config.routes.get("/v1/factors/{factor}/charts/cumulative", charts::cumulative);
            config.routes.get("/v1/factors/{factor}/charts/drawdowns", charts::drawdowns);
            config.routes.get("/v1/factors/{factor}/charts/significance", charts::significance);
            config.routes.get("/v1/factors/{factor}/charts/portfolios", charts::portfolios);
            config.routes.get("/v1/factors/{factor}/charts/ic", charts::ic);
            config.routes.get("/v1/charts/correlations", charts::correlations);
            config.routes.get("/v1/evidence", evidence::table);
            config.routes.get("/v1/factors/{factor}/evidence", evidence::factor);
            config.routes.get("/v1/themes", evidence::themes);
            config.routes.get("/v1/themes/{theme}/returns", evidence::themeReturns);

            config.routes.get("/v1/loadings", loadings::get);
            config.routes.get("/v1/loadings/{security}", loadings::securityHistory);
            config.routes.post("/v1/exposures", loadings::exposures);
            config.routes.post("/v1/risk", library::risk);
            config.routes.put("/v1/panels/{panel}/loadings-config", loadings::putConfig);
            config.routes.get("/v1/panels/{panel}/loadings-config", loadings::getConfig);
            config.routes.post("/v1/panels/{panel}/loadings-config/history", loadings::history);

            config.routes.get("/v1/factors/{factor}/portfolios", crossSection::portfolios);
            config.routes.get("/v1/factors/{factor}/ic", crossSection::informationCoefficients);
            config.routes.post("/v1/fama-macbeth", crossSection::famaMacBeth);
            config.routes.get("/v1/model-tests", crossSection::modelTests);

            mapErrors(config);
        });
    }

    /**
     * The one place where failures become {@code application/problem+json}: the domain's exceptions (unknown name 404,
     * invalid request 400, conflict 409), {@link ApiProblem} for HTTP-level problems, Javalin's own errors, and 500
     * for anything unexpected.
     */
    static void mapErrors(JavalinConfig config) {
        config.routes.exception(UnknownNameException.class, (e, ctx) -> problem(ctx, 404, "Not found", withListing(e.getMessage(), e.listed()),
                java.util.List.of()));
        config.routes.exception(InvalidRequestException.class, (e, ctx) -> problem(ctx, 400, "Bad request",
                withListing(e.getMessage(), e.listed()), java.util.List.of()));
        config.routes.exception(InsufficientDataException.class, (e, ctx) -> problem(ctx, 400, "Bad request", e.getMessage(), java.util.List.of()));
        config.routes.exception(ConflictException.class, (e, ctx) -> problem(ctx, 409, "Conflict", e.getMessage(), java.util.List.of()));
        config.routes.exception(ApiProblem.class, (e, ctx) -> problem(ctx, e.status(), e.title(), e.detail(), e.errors()));
        config.routes.exception(SignalPreview.InvalidSignalException.class, (e, ctx) -> problem(ctx, 400, "Invalid signal",
                e.getMessage(), messages(e.problems())));
        config.routes.exception(Families.InvalidFamilyException.class, (e, ctx) -> problem(ctx, 400, "Invalid family",
                e.getMessage(), messages(e.problems())));
        config.routes.exception(SignalPreview.PanelNotFoundException.class, (e, ctx) -> problem(ctx, 404, "Not found",
                withListing(e.getMessage(), NameKind.PANEL), java.util.List.of()));
        config.routes.exception(UploadSpool.UploadTooLargeException.class, (e, ctx) -> problem(ctx, 413, "Content too large",
                e.getMessage(), java.util.List.of()));
        config.routes.exception(UploadSpool.StorageFullException.class, (e, ctx) -> problem(ctx, 507, "Insufficient storage",
                e.getMessage(), java.util.List.of()));
        config.routes.exception(HttpResponseException.class, (e, ctx) -> {
            if (e.getStatus() == 413) {
                Uploads.discardRest(ctx); // a JSON body past its limit, refused unread: see Uploads.DISCARD_LIMIT
            }
            problem(ctx, e.getStatus(), titleOf(e.getStatus()), detailOf(e, ctx), java.util.List.of());
        });
        config.routes.exception(Exception.class, (e, ctx) -> {
            if (StorageFaults.isStorageFault(e)) {
                StorageFaultLog.note(LOG, ctx.method() + " " + ctx.path(), e);
                boolean full = StorageFaults.isDiskFull(e);
                ctx.header("Retry-After", "30");
                problem(ctx, full ? 507 : 503, full ? "Insufficient storage" : "Service unavailable",
                        (full ? "The disk holding the store is full" : "The store cannot be used right now")
                                + "; nothing was changed by this request. Try again once the operator has fixed the "
                                + "storage (GET /health tells when the store is back).", java.util.List.of());
                return;
            }
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
    }

    /** Problem sentences as the {@code errors} list of a problem body. */
    private static java.util.List<Map<String, Object>> messages(java.util.List<String> problems) {
        java.util.List<Map<String, Object>> errors = new java.util.ArrayList<>();
        for (String p : problems) {
            errors.add(Map.of("message", p));
        }
        return errors;
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

    /** A domain message naming something unknown, and where names of its kind are listed. */
    static String withListing(String message, NameKind listed) {
        if (listed == null) {
            return message;
        }
        String where = switch (listed) {
            case FACTOR -> "GET /v1/factors";
            case PANEL -> "GET /v1/panels";
            case FAMILY -> "GET /v1/families";
            case THEME -> "GET /v1/themes";
        };
        return message + "; " + where + " lists them.";
    }

    static void problem(Context ctx, int status, String title, String detail, java.util.List<Map<String, Object>> errors) {
        Json.respond(ctx, status, ApiProblem.Body.of(title, status, detail, ctx.path(), errors));
        ctx.contentType(PROBLEM_JSON);
    }

}
