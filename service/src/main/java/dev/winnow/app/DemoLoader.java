package dev.winnow.app;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.ingest.UploadMode;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobParams;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.FactorDefinitions;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobState;
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
                int version = factors.current(name).orElseThrow().version();
                String file = spool(entry.path("series_file").asText());
                pending.add(queue.enqueue(new JobParams.SeriesUpload(name, version, UploadMode.APPEND, file, false)));
                names.add(name);
            }
        }
        long panelJob = queue.enqueue(new JobParams.PanelUpload("demo-market", UploadMode.APPEND, spool(PANEL_FILE), true));
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

    /** Spools a packaged file as an upload body; returns its path relative to the spool. */
    private String spool(String file) throws IOException {
        try (InputStream in = resource(file)) {
            return spool.write(in).relativePath();
        }
    }

    private void awaitAll(List<Long> jobIds) throws InterruptedException {
        long deadline = System.nanoTime() + Duration.ofMinutes(10).toNanos();
        for (long id : jobIds) {
            while (true) {
                JobRecord job = jobs.find(id).orElseThrow();
                if (job.state() == JobState.FAILED) {
                    throw new IllegalStateException("demo job " + id + " (" + job.kind().wireName() + ") failed: " + job.errors());
                }
                if (job.state() == JobState.SUCCEEDED) {
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
