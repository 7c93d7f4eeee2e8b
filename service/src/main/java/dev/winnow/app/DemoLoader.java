package dev.winnow.app;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobKinds;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.FactorDefinitions;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.PanelStore;

import java.io.IOException;
import java.io.InputStream;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Loads the invented demo scenario (packaged from seed-data/) into an empty store through the same jobs and checks
 * as the API: the external series first, then the panel, then every factor definition.
 */
final class DemoLoader {
    private static final String PANEL_FILE = "demo-market.csv.gz";

    private final PanelStore panels;
    private final FactorStore factors;
    private final JobStore jobs;
    private final JobQueue queue;
    private final UploadSpool spool;
    private final FactorDefinitions definitions;

    DemoLoader(PanelStore panels, FactorStore factors, JobStore jobs, JobQueue queue, UploadSpool spool, FactorDefinitions definitions) {
        this.panels = panels;
        this.factors = factors;
        this.jobs = jobs;
        this.queue = queue;
        this.spool = spool;
        this.definitions = definitions;
    }

    boolean storeIsEmpty() {
        return panels.listVisible().isEmpty() && factors.listCurrent(true).isEmpty();
    }

    /** Loads everything and waits for the jobs; returns the names of the factors defined. */
    List<String> load() throws IOException, FactorDefinitions.InvalidDefinitionException, InterruptedException {
        JsonNode entries = new ObjectMapper().readTree(resource("factors.json"));
        List<String> names = new ArrayList<>();
        List<Long> pending = new ArrayList<>();
        for (JsonNode entry : entries) {
            if (entry.has("series_file")) {
                String name = entry.path("name").asText();
                definitions.define(name, entry.path("definition"));
                pending.add(enqueueUpload(JobKinds.SERIES_UPLOAD, entry.path("series_file").asText(), false,
                        Map.of("factor", name, "version", factors.current(name).orElseThrow().version())));
                names.add(name);
            }
        }
        long panelJob = enqueueUpload(JobKinds.PANEL_UPLOAD, PANEL_FILE, true, Map.of("panel", "demo-market"));
        pending.add(panelJob);
        awaitAll(pending);
        pending.clear();
        for (JsonNode entry : entries) {
            if (!entry.has("series_file")) {
                String name = entry.path("name").asText();
                FactorDefinitions.Defined defined = definitions.define(name, entry.path("definition"));
                if (defined.buildJob() != null) {
                    pending.add(defined.buildJob());
                }
                names.add(name);
            }
        }
        awaitAll(pending);
        return names;
    }

    private long enqueueUpload(String kind, String file, boolean gzip, Map<String, Object> target) throws IOException {
        UploadSpool.Spooled spooled;
        try (InputStream in = resource(file)) {
            spooled = spool.write(in);
        }
        Map<String, Object> params = new LinkedHashMap<>(target);
        params.put("mode", "append");
        params.put("file", spooled.relativePath());
        params.put("gzip", gzip);
        return queue.enqueue(kind, params);
    }

    private void awaitAll(List<Long> jobIds) throws InterruptedException {
        long deadline = System.nanoTime() + Duration.ofMinutes(10).toNanos();
        for (long id : jobIds) {
            while (true) {
                JobRecord job = jobs.find(id).orElseThrow();
                if (job.state().equals("failed")) {
                    throw new IllegalStateException("demo job " + id + " (" + job.kind() + ") failed: " + job.errors());
                }
                if (job.state().equals("succeeded")) {
                    break;
                }
                if (System.nanoTime() > deadline) {
                    throw new IllegalStateException("demo job " + id + " did not finish in 10 minutes");
                }
                Thread.sleep(50);
            }
        }
    }

    private static InputStream resource(String name) throws IOException {
        InputStream in = DemoLoader.class.getResourceAsStream("/seed-data/" + name);
        if (in == null) {
            throw new IOException("the demo scenario file seed-data/" + name + " is missing from the build");
        }
        return in;
    }
}
