package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.construct.CrossSection;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.research.LoadingsService;
import dev.winnow.stats.CrossSectionalZScore;
import dev.winnow.store.LoadingsTestStore;
import io.javalin.Javalin;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.LocalDate;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The loadings handlers over HTTP on a bare server (no auth) with a generated store: answer shapes, CSV, stored
 * versus computed answers, portfolio exposures, characteristic exposures and the problems bad input gets.
 * Numbers are checked against the computation the construct tests verify, or recomputed here by their formulas.
 */
class LoadingsRoutesTest {
    private static final int SECURITIES = 20;
    private static final int DATES = 70;
    private static final String PANEL = "harbor-equities";
    private static final String FACTORS = "factors=mkt,value,carry&window=30&min_obs=15";
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private static LoadingsTestStore store;
    private static Javalin server;
    private static List<LocalDate> dates;
    private static List<CrossSection> slices;
    private static long panelId;
    private static final HttpClient CLIENT = HttpClient.newHttpClient();

    @BeforeAll
    static void start() {
        store = new LoadingsTestStore();
        dates = LoadingsTestStore.weekdays(LocalDate.of(2024, 1, 1), DATES);
        double[][] f = LoadingsTestStore.factorReturns(5, 3, DATES);
        slices = LoadingsTestStore.slices(6, SECURITIES, dates, f, 0, DATES - 1);
        panelId = store.upload(PANEL, SECURITIES, slices, true);
        store.factor("mkt", dates, f[0]);
        store.factor("value", dates, f[1]);
        store.factor("carry", dates, f[2]);
        LoadingsRoutes routes = new LoadingsRoutes(store.panels,
                new LoadingsService(store.panels, store.factors, store.loadings, new JobQueue(store.jobs)));
        server = Javalin.create(config -> {
            config.startup.showJavalinBanner = false;
            config.jetty.host = "127.0.0.1";
            config.jetty.port = 0;
            config.routes.get("/v1/loadings", routes::get);
            config.routes.get("/v1/loadings/{security}", routes::securityHistory);
            config.routes.post("/v1/exposures", routes::exposures);
            config.routes.put("/v1/panels/{panel}/loadings-config", routes::putConfig);
            config.routes.get("/v1/panels/{panel}/loadings-config", routes::getConfig);
            config.routes.post("/v1/panels/{panel}/loadings-config/history", routes::history);
            ApiServer.mapErrors(config);
        }).start();
    }

    @AfterAll
    static void stop() {
        server.stop();
        store.close();
    }

    private record Reply(int status, String body, String source, String contentType) {
        JsonNode json() {
            try {
                return MAPPER.readTree(body);
            } catch (IOException e) {
                throw new AssertionError(body, e);
            }
        }
    }

    private static Reply send(HttpRequest.Builder request) {
        try {
            HttpRequest built = request.build();
            HttpResponse<String> r = CLIENT.send(built, HttpResponse.BodyHandlers.ofString());
            ContractValidator.shared().check(built.method(), built.uri(), r.statusCode(),
                    r.headers().firstValue("Content-Type").orElse(null), r.body());
            return new Reply(r.statusCode(), r.body(), r.headers().firstValue("Winnow-Loadings-Source").orElse(null),
                    r.headers().firstValue("Content-Type").orElse(""));
        } catch (IOException | InterruptedException e) {
            throw new AssertionError(e);
        }
    }

    private static HttpRequest.Builder request(String path) {
        return HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path));
    }

    private static Reply get(String path) {
        return send(request(path).GET());
    }

    private static Reply getCsv(String path) {
        return send(request(path).header("Accept", "text/csv").GET());
    }

    private static Reply send(String method, String path, String json) {
        return send(request(path).header("Content-Type", "application/json").method(method, HttpRequest.BodyPublishers.ofString(json)));
    }

    private static void assertProblem(Reply r, int status, String detailPart) {
        assertEquals(status, r.status(), r.body());
        assertTrue(r.contentType().startsWith("application/problem+json"), r.contentType());
        String detail = r.json().path("detail").asText();
        assertTrue(detail.contains(detailPart), "'" + detail + "' should mention '" + detailPart + "'");
    }

    @Test
    void regressionLoadingsAsJsonAndCsv() {
        LocalDate date = dates.get(20);
        Reply r = get("/v1/loadings?panel=" + PANEL + "&date=" + date + "&" + FACTORS);
        assertEquals(200, r.status(), r.body());
        JsonNode body = r.json();
        assertEquals(date.toString(), body.get("date").asText());
        assertEquals(List.of("mkt", "value", "carry"), MAPPER.convertValue(body.get("factors"), List.class));
        assertEquals(30, body.get("window").asInt());
        JsonNode securities = body.get("securities");
        assertEquals(slices.get(20).size(), securities.size(), "every security with a row at the date");
        JsonNode first = securities.get(0);
        assertEquals("ACME-0001", first.get("security").asText());
        assertEquals(3, first.get("betas").size());
        assertTrue(first.get("reason").isNull());
        JsonNode late = securities.get(LoadingsTestStore.lateSecurity(SECURITIES) - 1);
        assertEquals(LoadingsTestStore.code(LoadingsTestStore.lateSecurity(SECURITIES)), late.get("security").asText());
        assertTrue(late.get("alpha").isNull() && late.get("betas").get(0).isNull(), "too few dates: null loadings");
        assertEquals(late.get("n").asInt() + " usable dates, fewer than min_obs 15", late.get("reason").asText());

        Reply csv = getCsv("/v1/loadings?panel=" + PANEL + "&date=" + date + "&" + FACTORS);
        assertTrue(csv.contentType().startsWith("text/csv"), csv.contentType());
        String[] lines = csv.body().split("\n");
        assertEquals("security,n,alpha,beta_mkt,beta_value,beta_carry,r_squared,residual_vol", lines[0]);
        assertEquals(securities.size() + 1, lines.length);
        String[] cells = lines[1].split(",", -1);
        assertEquals(first.get("alpha").asDouble(), Double.parseDouble(cells[2]));
        assertEquals(first.get("residual_vol").asDouble(), Double.parseDouble(cells[7]));
        assertEquals(get("/v1/loadings?panel=" + PANEL + "&date=" + date + "&" + FACTORS + "&format=csv").body(), csv.body());
    }

    @Test
    void configuredLoadingsAreServedFromTheStoreIdenticallyOnceComputed() {
        Reply put = send("PUT", "/v1/panels/" + PANEL + "/loadings-config", "{\"factors\":[\"mkt\",\"value\",\"carry\"],\"window\":30}");
        assertEquals(200, put.status(), put.body());
        assertEquals(15, put.json().get("min_obs").asInt(), "min_obs defaults to window / 2");
        assertEquals(30, get("/v1/panels/" + PANEL + "/loadings-config").json().get("window").asInt());

        Reply computed = get("/v1/loadings?panel=" + PANEL);
        assertEquals(200, computed.status(), computed.body());
        assertEquals("computed", computed.source());
        assertEquals(dates.get(DATES - 1).toString(), computed.json().get("date").asText(), "the date defaults to the last one");

        Reply job = send("POST", "/v1/panels/" + PANEL + "/loadings-config/history", "");
        assertEquals(202, job.status(), job.body());
        assertTrue(job.json().get("job").asText().matches("\\d+"));
        new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });

        Reply stored = get("/v1/loadings?panel=" + PANEL);
        assertEquals("stored", stored.source());
        assertEquals(computed.body(), stored.body(), "stored answer equals the computed one byte for byte");
        assertEquals("stored", get("/v1/loadings?panel=" + PANEL + "&" + FACTORS).source(), "same settings given explicitly");
        assertEquals("computed", get("/v1/loadings?panel=" + PANEL + "&window=31").source(), "other settings are computed");
    }

    @Test
    void securityHistoryMatchesTheCrossSectionalAnswers() {
        String code = LoadingsTestStore.code(3);
        Reply r = get("/v1/loadings/" + code + "?panel=" + PANEL + "&" + FACTORS + "&from=" + dates.get(40) + "&to=" + dates.get(45));
        assertEquals(200, r.status(), r.body());
        JsonNode body = r.json();
        assertEquals(6, body.get("dates").size());
        assertEquals(3, body.get("betas").size());
        for (int t = 0; t < 6; t++) {
            JsonNode cross = get("/v1/loadings?panel=" + PANEL + "&date=" + dates.get(40 + t) + "&" + FACTORS).json().get("securities").get(2);
            assertEquals(code, cross.get("security").asText());
            assertEquals(cross.get("alpha").asDouble(), body.get("alpha").get(t).asDouble());
            assertEquals(cross.get("betas").get(1).asDouble(), body.get("betas").get(1).get(t).asDouble());
            assertEquals(cross.get("r_squared").asDouble(), body.get("r_squared").get(t).asDouble());
            assertEquals(cross.get("n").asInt(), body.get("n").get(t).asInt());
        }
        String late = LoadingsTestStore.code(LoadingsTestStore.lateSecurity(SECURITIES));
        JsonNode early = get("/v1/loadings/" + late + "?panel=" + PANEL + "&" + FACTORS + "&to=" + dates.get(20)).json();
        assertEquals(dates.get(DATES / 5).toString(), early.get("dates").get(0).asText(), "the late security's history starts with its first row");
        assertTrue(early.get("alpha").get(0).isNull() && early.get("betas").get(2).get(0).isNull(), "too few dates: null");
        assertProblem(get("/v1/loadings/NOPE-1?panel=" + PANEL + "&" + FACTORS), 404, "NOPE-1");
        assertProblem(get("/v1/loadings/" + code + "?panel=" + PANEL + "&" + FACTORS + "&from=2024-03-01&to=2024-02-01"), 400, "swap");
    }

    @Test
    void portfolioExposuresAreWeightedSumsOfCoveredBetas() {
        LocalDate date = dates.get(20);
        JsonNode securities = get("/v1/loadings?panel=" + PANEL + "&date=" + date + "&" + FACTORS).json().get("securities");
        String a = securities.get(0).get("security").asText();
        String b = securities.get(1).get("security").asText();
        String late = LoadingsTestStore.code(LoadingsTestStore.lateSecurity(SECURITIES));
        Reply r = send("POST", "/v1/exposures", "{\"panel\":\"" + PANEL + "\",\"date\":\"" + date + "\",\"factors\":[\"mkt\",\"value\",\"carry\"],"
                + "\"window\":30,\"min_obs\":15,\"holdings\":[{\"security\":\"" + a + "\",\"weight\":0.6},{\"security\":\"" + b
                + "\",\"weight\":-0.2},{\"security\":\"" + late + "\",\"weight\":0.1},{\"security\":\"GHOST\",\"weight\":0.1}]}");
        assertEquals(200, r.status(), r.body());
        JsonNode body = r.json();
        for (int j = 0; j < 3; j++) {
            double expected = 0.6 * securities.get(0).get("betas").get(j).asDouble() - 0.2 * securities.get(1).get("betas").get(j).asDouble();
            assertEquals(expected, body.get("exposures").get(j).asDouble(), 1e-15);
        }
        assertEquals(0.8 / 1.0, body.get("coverage").asDouble(), 1e-15);
        assertEquals(List.of(late, "GHOST"), MAPPER.convertValue(body.get("missing"), List.class));
        assertProblem(send("POST", "/v1/exposures", "{\"panel\":\"" + PANEL + "\",\"factors\":[\"mkt\"],\"holdings\":[]}"), 400, "holdings");
        assertProblem(send("POST", "/v1/exposures", "{\"panel\":\"" + PANEL + "\",\"factors\":[\"mkt\"],\"window\":30,\"holdings\":"
                + "[{\"security\":\"A\",\"weight\":\"x\"}]}"), 400, "weight");
    }

    @Test
    void characteristicExposuresAreWinsorisedZScores() {
        Reply r = get("/v1/loadings?panel=" + PANEL + "&date=" + dates.get(30) + "&kind=characteristic&columns=log_size,market_cap");
        assertEquals(200, r.status(), r.body());
        JsonNode body = r.json();
        assertEquals("characteristic", body.get("kind").asText());
        double[] expected = CrossSectionalZScore.winsorisedZScores(slices.get(30).numberColumn("log_size"));
        JsonNode securities = body.get("securities");
        for (int i = 0; i < securities.size(); i++) {
            assertEquals(expected[i], securities.get(i).get("exposures").get(0).asDouble(), 1e-15);
        }
        assertProblem(get("/v1/loadings?panel=" + PANEL + "&kind=characteristic&columns=shoe_size"), 400, "log_size");
        assertProblem(get("/v1/loadings?panel=" + PANEL + "&kind=characteristic"), 400, "columns");
    }

    @Test
    void badInputGetsProblemsNeverServerErrors() {
        String base = "/v1/loadings?panel=" + PANEL;
        assertProblem(get("/v1/loadings?factors=mkt"), 400, "panel");
        assertProblem(get("/v1/loadings?panel=no-such-panel&factors=mkt"), 400, "no-such-panel");
        assertProblem(get(base + "&factors=mkt,unicorn&window=30"), 400, "unicorn");
        assertProblem(get(base + "&factors=,&window=30"), 400, "at least one factor");
        assertProblem(get(base + "&factors=mkt,mkt&window=30"), 400, "twice");
        assertProblem(get(base + "&factors=mkt"), 400, "larger than the 70 dates");
        assertProblem(get(base + "&factors=mkt,value,carry&window=4"), 400, "at least the number of factors + 2");
        assertProblem(get(base + "&" + FACTORS.replace("min_obs=15", "min_obs=31")), 400, "min_obs");
        assertProblem(get(base + "&" + FACTORS + "&date=2024-13-01"), 400, "yyyy-mm-dd");
        LocalDate friday = dates.stream().filter(d -> d.getDayOfWeek().getValue() == 5).skip(2).findFirst().orElseThrow();
        assertProblem(get(base + "&" + FACTORS + "&date=" + friday.plusDays(1)), 400, "nearest dates are " + friday + " and " + friday.plusDays(3));
        assertProblem(get(base + "&" + FACTORS + "&date=2020-01-01"), 400, "precedes the first date");
        assertProblem(get(base + "&" + FACTORS + "&columns=log_size"), 400, "columns");
        assertProblem(get("/v1/panels/no-such-panel/loadings-config"), 404, "no-such-panel");
        assertProblem(send("PUT", "/v1/panels/" + PANEL + "/loadings-config", "{\"factors\":[]}"), 400, "at least one factor");
        assertProblem(send("PUT", "/v1/panels/" + PANEL + "/loadings-config", "{\"factors\":[\"mkt\"],\"window\":\"long\"}"), 400, "window");
        assertProblem(send("PUT", "/v1/panels/" + PANEL + "/loadings-config", "{\"factors\":[\"mkt\"],\"span\":3}"), 400, "span");
    }
}
