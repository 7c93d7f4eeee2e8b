package dev.winnow.api;

import dev.winnow.app.Config;
import org.junit.jupiter.api.Test;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** GET /metrics: the Prometheus text format with the meters openapi.yaml lists, behind a read token unless public. */
class MetricsEndToEndTest {

    private static final String PANEL = """
            date,security,return,market_cap,score
            2020-01-31,A,0.00,100,1
            2020-01-31,B,0.00,200,2
            2020-02-29,A,0.01,100,2
            2020-02-29,B,0.03,200,1
            2020-03-31,A,-0.02,100,1
            2020-03-31,B,0.00,200,2
            """;

    @Test
    void metricsCountRequestsJobsRowsCacheAndPoolBehindAReadToken() throws Exception {
        try (TestServer server = new TestServer()) {
            assertEquals("succeeded", server.upload("/v1/panels/m/uploads", PANEL).path("state").asText());
            TestServer.Reply defined = server.putJson("/v1/factors/m_score",
                    "{\"panel\":\"m\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":2,\"theme\":\"t\",\"rationale\":\"r\"}", ADMIN);
            server.awaitJob(defined.json().path("job").asText());
            assertEquals(200, server.get("/v1/factors/m_score/returns").status());
            assertEquals(200, server.get("/v1/factors/m_score/returns").status());
            assertEquals(404, server.get("/no/such/path").status());

            TestServer.assertProblem(server.get("/metrics", null), 401);
            String read = server.postJson("/v1/tokens", "{\"name\":\"scraper\",\"scope\":\"read\"}", ADMIN).json().path("token").asText();
            TestServer.Reply r = server.get("/metrics", read);
            assertEquals(200, r.status(), r.body());
            assertTrue(r.header("Content-Type").startsWith("text/plain"), r.header("Content-Type"));
            String text = r.body();
            for (String expected : new String[] {
                    "http_server_requests_seconds_bucket{method=\"GET\",route=\"/v1/factors/{factor}/returns\",status=\"200\",le=\"0.001\"}",
                    "http_server_requests_seconds_count{method=\"GET\",route=\"unmatched\",status=\"404\"} 1",
                    "http_server_requests_seconds_count{method=\"POST\",route=\"/v1/panels/{panel}/uploads\",status=\"202\"} 1",
                    "winnow_jobs_seconds_count{kind=\"panel_upload\",state=\"succeeded\"} 1",
                    "winnow_jobs_seconds_count{kind=\"factor_build\",state=\"succeeded\"} 1",
                    "winnow_jobs_seconds_bucket{kind=\"factor_build\",state=\"succeeded\",le=",
                    "winnow_rows_ingested_total{kind=\"panel_upload\"} 6.0",
                    "winnow_jobs_queued 0.0",
                    "winnow_jobs_running 0.0",
                    "winnow_cache_requests_total{cache=\"series\",result=\"hit\"}",
                    "winnow_cache_requests_total{cache=\"series\",result=\"miss\"}",
                    "winnow_cache_requests_total{cache=\"responses\",result=\"miss\"}",
                    "hikaricp_connections_active{pool=\"winnow\"}",
                    "hikaricp_connections_max{pool=\"winnow\"} 16.0",
                    "jvm_memory_used_bytes{area=\"heap\"",
                    "jvm_gc_",
            }) {
                assertTrue(text.contains(expected), "missing " + expected + " in:\n" + text);
            }
            assertTrue(hits(text) >= 1, "the second identical series request is a cache hit:\n" + text);
        }
    }

    private static double hits(String text) {
        return text.lines().filter(l -> l.startsWith("winnow_cache_requests_total{cache=") && l.contains("result=\"hit\""))
                .mapToDouble(l -> Double.parseDouble(l.substring(l.lastIndexOf(' ') + 1))).sum();
    }

    @Test
    void metricsAreOpenWhenConfiguredPublic() throws Exception {
        try (TestServer server = new TestServer(Config.Instance.DEFAULT.withMetricsPublic(true))) {
            TestServer.Reply r = server.get("/metrics", null);
            assertEquals(200, r.status(), r.body());
            assertTrue(r.body().contains("jvm_memory_used_bytes"), r.body());
            TestServer.assertProblem(server.get("/v1/panels", null), 401);
        }
    }
}
