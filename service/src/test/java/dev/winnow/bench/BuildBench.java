package dev.winnow.bench;

import dev.winnow.construct.CheckpointedBuild;
import dev.winnow.construct.ConstructionFixtures;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.ingest.ColumnType;
import dev.winnow.ingest.PanelParseResult;
import dev.winnow.ingest.PanelUpload;
import dev.winnow.ingest.PanelUploadParser;
import dev.winnow.ingest.ProgressListener;
import dev.winnow.ingest.UploadMode;
import dev.winnow.jobs.PanelUploadJob;
import dev.winnow.research.FactorBuilds;
import dev.winnow.store.Database;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobKind;
import dev.winnow.store.JobStore;
import dev.winnow.store.PanelStore;
import dev.winnow.store.TestDatabase;
import dev.winnow.store.SecurityDictionary;
import dev.winnow.store.SliceStager;
import dev.winnow.store.StorePanelSource;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Stream;

/**
 * The ingest job's phases and the build of one sort, in one process without HTTP, on a panel CSV such as the one the
 * DuckDB comparison generates (kept with its {@code --work} folder). Ingests the file into a temporary H2 store the
 * way the upload job does (one-pass parse, background staging, commit), then builds the comparison's sort (quintiles,
 * cap-weighted, momentum_12_1, every period, lag 1) several times: reading and decoding the slices alone, then the
 * whole construction. Times are wall clock and CPU (this thread's, and for the job's work the whole process's, since
 * the build may use more threads). {@code --store=DIR} keeps a copy of the ingested store in DIR and works on a fresh copy of it
 * on the next invocations (skipping the ingest). Not a unit test; run by hand:
 *
 * <pre>
 *   mvn -q -B -o test-compile
 *   java -Xmx512m -cp "service/target/classes:service/target/test-classes:$(cat cp.txt)" dev.winnow.bench.BuildBench \
 *        /tmp/wbench/panel-3000x6300.csv [--runs=3] [--store=DIR]
 * </pre>
 */
public final class BuildBench {
    private static final String SORT = "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\","
            + "\"direction\":\"high_minus_low\",\"buckets\":5,\"weighting\":\"cap\",\"lag\":1,\"rebalance\":\"every_period\"}";
    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();

    private BuildBench() {
    }

    public static void main(String[] args) throws Exception {
        Path csv = Path.of(args[0]);
        int runs = 3;
        Path keep = null;
        for (String arg : args) {
            if (arg.startsWith("--runs=")) {
                runs = Integer.parseInt(arg.substring(7));
            } else if (arg.startsWith("--store=")) {
                keep = Path.of(arg.substring(8));
            }
        }
        Path dir = Files.createTempDirectory("winnow-buildbench");
        boolean reuse = keep != null && Files.exists(keep.resolve("store.mv.db"));
        if (reuse) {
            // a copy, so that every invocation starts from the store as the ingest left it (no factors yet)
            Files.copy(keep.resolve("store.mv.db"), dir.resolve("store.mv.db"));
        }
        String url = "jdbc:h2:file:" + dir.resolve("store").toAbsolutePath() + ";FILE_LOCK=FS;WRITE_DELAY=0";
        Database db = Database.open(url);
        try {
            PanelStore panels = TestDatabase.panels(db.jdbi());
            long panelId = reuse ? panels.find("bench").orElseThrow().id() : ingest(db, panels, csv, dir);
            if (keep != null && !reuse) {
                db.close();
                Files.createDirectories(keep);
                Files.copy(dir.resolve("store.mv.db"), keep.resolve("store.mv.db"));
                db = Database.open(url);
                panels = TestDatabase.panels(db.jdbi());
            }
            FactorDefinition def = DefinitionJson.read(SORT).definition();
            FactorStore factors = new FactorStore(db.jdbi());
            String prefix = "mom" + System.currentTimeMillis() % 1_000_000 + "_";
            for (int r = 1; r <= runs; r++) {
                // the build job's work first, so that run 1 is as cold as the service's first build
                FactorStore.FactorVersionRecord v = factors.define(prefix + r, DefinitionJson.toCanonicalString(def), def.method(), panelId).version();
                long c3 = THREADS.getCurrentThreadCpuTime();
                long p3 = processCpuNanos();
                long t3 = System.nanoTime();
                new FactorBuilds(panels, factors, ConstructionFixtures.FORMING).rebuild(v);
                long t4 = System.nanoTime();
                long c4 = THREADS.getCurrentThreadCpuTime();
                long p4 = processCpuNanos();
                System.out.printf(Locale.ROOT, "run %d: the build job's work (construct and save): %.3f s wall, %.3f s CPU (this thread), "
                                + "%.3f s CPU (process); load %.1f%n", r, (t4 - t3) / 1e9, (c4 - c3) / 1e9, (p4 - p3) / 1e9,
                        ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage());
                long c0 = THREADS.getCurrentThreadCpuTime();
                long t0 = System.nanoTime();
                StorePanelSource source = panels.source(panelId, def.columnsRead()::contains);
                long rows = 0;
                for (int i = 0; i < source.dates().size(); i++) {
                    CrossSection cs = source.crossSection(i);
                    rows += cs.size();
                }
                long t1 = System.nanoTime();
                long c1 = THREADS.getCurrentThreadCpuTime();
                StorePanelSource again = panels.source(panelId, def.columnsRead()::contains);
                CheckpointedBuild.Result result = CheckpointedBuild.run(def, again, null, null, 0, 0, 252, ConstructionFixtures.FORMING);
                long t2 = System.nanoTime();
                long c2 = THREADS.getCurrentThreadCpuTime();
                System.out.printf(Locale.ROOT, "       peer: read+decode %d dates (%,d rows) %.3f s wall %.3f s CPU; "
                                + "build without saving (read, decode, construct) %.3f s wall %.3f s CPU, %d observations%n",
                        source.dates().size(), rows, (t1 - t0) / 1e9, (c1 - c0) / 1e9, (t2 - t1) / 1e9, (c2 - c1) / 1e9,
                        result.build().observations().size());
            }
        } finally {
            db.close();
            try (Stream<Path> files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /** CPU time of the whole process (all threads), NaN-free: 0 where the JVM does not say. */
    private static long processCpuNanos() {
        return ManagementFactory.getOperatingSystemMXBean() instanceof com.sun.management.OperatingSystemMXBean os
                ? os.getProcessCpuTime() : 0;
    }

    private static long ingest(Database db, PanelStore panels, Path csv, Path dir) throws Exception {
        long jobId = new JobStore(db.jdbi()).enqueue(JobKind.PANEL_UPLOAD, "{}");
        long panelId = panels.createPanelIfAbsent("bench");
        long uploadId = panels.beginUpload(panelId, jobId, "append");
        PanelUpload upload = new PanelUpload(csv, false, UploadMode.APPEND, null, Map.of());
        long t0 = System.nanoTime();
        PanelParseResult result;
        SliceStager.Stats staged;
        long parsed;
        try (SliceStager stager = panels.stager(panelId, uploadId)) {
            SecurityDictionary ids = panels.batchedSecurityDictionary(panelId, uploadId);
            result = new PanelUploadParser().parse(upload, ids::idFor, PanelUploadJob.sinkInto(stager), ProgressListener.NONE);
            parsed = System.nanoTime();
            ids.flush();
            staged = stager.finish();
        }
        long t1 = System.nanoTime();
        if (!result.accepted()) {
            throw new IllegalStateException("upload rejected: " + result.errors());
        }
        Map<String, String> newColumns = new LinkedHashMap<>();
        result.newColumns().forEach((name, type) -> newColumns.put(name, type == ColumnType.NUMBER ? "number" : "label"));
        newColumns.put(PanelUpload.MARKET_CAP, "number");
        panels.commitUpload(panelId, uploadId, newColumns);
        long t2 = System.nanoTime();
        System.out.printf(Locale.ROOT, "ingest %,d rows: parse %.2f s, staging after the parse %.2f s (stager busy: encode %.2f s, "
                        + "writes %.2f s), commit %.2f s; %d slices, %.0f MB of payloads, store %.0f MB%n",
                result.rowsAccepted(), (parsed - t0) / 1e9, (t1 - parsed) / 1e9, staged.encodeNanos() / 1e9,
                staged.writeNanos() / 1e9, (t2 - t1) / 1e9, staged.slices(), staged.bytes() / 1e6, size(dir) / 1e6);
        return panelId;
    }

    private static long size(Path dir) throws IOException {
        try (Stream<Path> files = Files.walk(dir)) {
            return files.filter(Files::isRegularFile).mapToLong(p -> p.toFile().length()).sum();
        }
    }
}
