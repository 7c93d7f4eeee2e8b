package dev.winnow.bench;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.app.BenchClient;
import dev.winnow.app.seed.SyntheticPanelWriter;

import java.io.BufferedReader;
import java.io.IOException;
import java.net.ServerSocket;
import java.net.URISyntaxException;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Winnow against DuckDB on the same generated panel, in one run:
 * <pre>
 *   mvn -q -B -Pbench -DskipTests package
 *   java -jar bench/target/winnow-bench.jar [securities=3000] [dates=6300] [--runs=1] [--xmx=512m] [--work=DIR]
 * </pre>
 * Generates the seven-column synthetic daily panel ({@link SyntheticPanelWriter#NARROW_HEADER}), then per run:
 * <ul>
 *   <li>DuckDB (JDBC, in this process, a new database file): {@code CREATE TABLE p AS SELECT * FROM read_csv(...)}
 *       and one SQL query computing the quintile cap-weighted sort on {@code momentum_12_1}, formed every period
 *       with lag 1, timed together;</li>
 *   <li>Winnow, started from the service jar as a child process with {@code -Xmx512m} on an empty store: the upload
 *       over HTTP until its job succeeded, then the same sort defined and built, timed together from the first byte
 *       sent to the build job's end as seen by the client;</li>
 * </ul>
 * and prints both times and their ratio, both store sizes and their ratio, Winnow's peak resident set (VmHWM of the
 * service process over the whole run), the build job's own time, and the largest difference between the two sort
 * series (they compute the same thing, so it should be rounding only). Finally Winnow defines nine more factors and
 * times the revision of the panel's first date, which brings all ten up to date.
 *
 * <p>The machine is shared, so only ratios measured in one run mean much; {@code --runs} alternates the two systems.
 * {@code --work} keeps the generated CSV in that folder for the next invocation; {@code --jvm=ARG} (repeatable) passes
 * an option to the service's JVM, e.g. {@code --jvm=-XX:StartFlightRecording=filename=/tmp/w.jfr}.
 */
public final class CompareBench {

    private static final String TOKEN = "bench-admin-token";
    private static final String PANEL = "bench";
    private static final ObjectMapper JSON = new ObjectMapper();
    static final String SORT_DEFINITION = "{\"panel\":\"" + PANEL + "\",\"method\":\"sort\",\"signal\":\"momentum_12_1\","
            + "\"direction\":\"high_minus_low\",\"buckets\":5,\"weighting\":\"cap\",\"lag\":1,\"rebalance\":\"every_period\"}";
    /** Nine more definitions on the seven-column panel, so that a revision brings ten factors up to date. */
    private static final String[] MORE_DEFINITIONS = {
        "{\"panel\":\"bench\",\"method\":\"market\"}",
        "{\"panel\":\"bench\",\"method\":\"size_sort\",\"signal\":\"book_to_price\",\"rebalance\":\"monthly\"}",
        "{\"panel\":\"bench\",\"method\":\"size_sort\",\"signal\":\"book_to_price\",\"output\":\"size\",\"rebalance\":\"monthly\"}",
        "{\"panel\":\"bench\",\"method\":\"size_sort\",\"signal\":\"momentum_12_1\",\"rebalance\":\"monthly\"}",
        "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"book_to_price\",\"rebalance\":\"monthly\"}",
        "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"book_to_price\",\"weighting\":\"cap\",\"rebalance\":\"quarterly\"}",
        "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"book_to_price\",\"rebalance\":\"annual\",\"rebalance_month\":6,\"lag\":2}",
        "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\",\"buckets\":10,\"weighting\":\"cap\",\"rebalance\":\"monthly\"}",
        "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\",\"direction\":\"low_minus_high\",\"buckets\":3}",
    };

    /**
     * The sort of {@link #SORT_DEFINITION} as one query over table p, following Winnow's construction rules: eligible
     * rows have a signal and a positive market cap; breakpoints are type-7 quantiles (DuckDB's quantile_cont,
     * linear interpolation); a value at a breakpoint goes to the lower bucket; the portfolio formed at date t holds
     * its members at t's market caps and earns at the next grid date the cap-weighted return of those members that
     * have one there; the spread is the top quintile minus the bottom one, and a date where either leg is empty has
     * no observation. The legs are materialised before the join with the next date's returns: left to itself, the
     * planner joined on security alone first (hundreds of millions of intermediate rows).
     */
    static final String SORT_SQL = """
            WITH grid AS (
                SELECT date, lead(date) OVER (ORDER BY date) AS next_date FROM (SELECT DISTINCT date FROM p)),
            eligible AS (
                SELECT date, security, momentum_12_1 AS signal, market_cap AS weight FROM p
                WHERE momentum_12_1 IS NOT NULL AND market_cap > 0),
            breakpoints AS (
                SELECT date, quantile_cont(signal, [0.2, 0.4, 0.6, 0.8]) AS q FROM eligible GROUP BY date),
            legs AS MATERIALIZED (
                SELECT g.next_date, e.security, e.weight,
                       CASE WHEN e.signal <= b.q[1] THEN 'low' WHEN e.signal > b.q[4] THEN 'high' END AS leg
                FROM eligible e JOIN breakpoints b ON b.date = e.date JOIN grid g ON g.date = e.date
                WHERE e.signal <= b.q[1] OR e.signal > b.q[4]),
            earned AS (
                SELECT l.next_date AS date, l.leg, sum(l.weight * r.return) / sum(l.weight) AS leg_return
                FROM legs l JOIN p r ON r.date = l.next_date AND r.security = l.security
                WHERE r.return IS NOT NULL
                GROUP BY l.next_date, l.leg)
            SELECT date, max(leg_return) FILTER (WHERE leg = 'high') - max(leg_return) FILTER (WHERE leg = 'low') AS spread
            FROM earned GROUP BY date HAVING count(*) = 2 ORDER BY date
            """;

    /**
     * The panel's column types, given to read_csv: its sniffer samples the first rows, where momentum_12_1 is still
     * empty (the signal needs a year of returns), and would make that column text. Winnow infers types from every row.
     */
    private static final String DUCK_COLUMNS = "{'date': 'DATE', 'security': 'VARCHAR', 'return': 'DOUBLE', "
            + "'market_cap': 'DOUBLE', 'book_to_price': 'DOUBLE', 'momentum_12_1': 'DOUBLE', 'sector': 'VARCHAR'}";

    /** Extra JVM options for the service process ({@code --jvm=...}, e.g. a flight recording to see where time goes). */
    private static final List<String> SERVICE_JVM_ARGS = new ArrayList<>();
    /**
     * Whether to upload the file once more, to a second panel, at the end: the ingest with the service's code
     * compiled, beside the first (which runs while the JIT compiles the parser, the encoder and H2's write path).
     * The store after shutdown then holds both panels, so its size is not comparable and is not printed as such.
     */
    private static boolean warmIngest;

    private BenchClient http;

    private CompareBench() {
    }

    public static void main(String[] args) throws Exception {
        int securities = 3000;
        int dates = 6300;
        int runs = 1;
        String xmx = "512m";
        Path work = null;
        int positional = 0;
        for (String arg : args) {
            if (arg.startsWith("--runs=")) {
                runs = Integer.parseInt(arg.substring(7));
            } else if (arg.startsWith("--xmx=")) {
                xmx = arg.substring(6);
            } else if (arg.startsWith("--work=")) {
                work = Path.of(arg.substring(7));
            } else if (arg.equals("--warm-ingest")) {
                warmIngest = true;
            } else if (arg.startsWith("--jvm=")) {
                SERVICE_JVM_ARGS.add(arg.substring(6));
            } else if (arg.startsWith("--")) {
                System.err.println("usage: java -jar winnow-bench.jar [securities] [dates] [--runs=N] [--xmx=512m] [--work=DIR] [--jvm=ARG ...] [--warm-ingest]");
                System.exit(2);
            } else if (positional++ == 0) {
                securities = Integer.parseInt(arg);
            } else {
                dates = Integer.parseInt(arg);
            }
        }
        new CompareBench().run(securities, dates, runs, xmx, work);
    }

    private void run(int securities, int dates, int runs, String xmx, Path work) throws Exception {
        Path dir = Files.createTempDirectory("winnow-compare");
        try {
            Path csv = (work != null ? Files.createDirectories(work) : dir).resolve("panel-" + securities + "x" + dates + ".csv");
            if (!Files.exists(csv)) {
                System.out.printf(Locale.ROOT, "generating %d securities x %d dates ...%n", securities, dates);
                Path partial = csv.resolveSibling(csv.getFileName() + ".partial");
                SyntheticPanelWriter.write(partial, securities, dates, SyntheticPanelWriter.DEFAULT_SEED, SyntheticPanelWriter.Columns.NARROW);
                Files.move(partial, csv);
            }
            long rows = (long) securities * dates;
            System.out.printf(Locale.ROOT, "panel: %,d rows (%d securities x %d dates), 7 columns (%s), %.2f GB of CSV%n",
                    rows, securities, dates, SyntheticPanelWriter.NARROW_HEADER, Files.size(csv) / 1e9);
            System.out.printf(Locale.ROOT, "job: upload + ingest + one quintile cap-weighted sort on momentum_12_1, every period, lag 1%n");
            for (int r = 1; r <= runs; r++) {
                System.out.printf(Locale.ROOT, "%n=== run %d of %d ===%n", r, runs);
                Path runDir = Files.createDirectories(dir.resolve("run" + r));
                DuckResult duck = duckDb(csv, runDir.resolve("duck.db"));
                System.out.printf(Locale.ROOT, "DuckDB %s: load %.2f s + sort %.2f s = %.2f s (%.1f CPU s); database file %.0f MB; %d dates in the series%n",
                        duck.version, duck.loadSeconds, duck.sortSeconds, duck.loadSeconds + duck.sortSeconds, duck.cpuSeconds,
                        duck.fileBytes / 1e6, duck.series.size());
                WinnowResult winnow = winnow(csv, runDir.resolve("winnow"), xmx, rows);
                double duckSeconds = duck.loadSeconds + duck.sortSeconds;
                System.out.printf(Locale.ROOT, "Winnow: upload answered 202 after %.2f s, ingest job %.2f s, build job %.2f s; "
                                + "upload to built %.2f s (%.2f M rows/s)%n",
                        winnow.acceptedSeconds, winnow.ingestJobSeconds, winnow.buildJobSeconds, winnow.totalSeconds,
                        rows / winnow.totalSeconds / 1e6);
                System.out.printf(Locale.ROOT, "  CPU: service %.1f s, upload client (" + winnow.client + ") %.1f s; CPU ratio service/DuckDB = %.2f "
                                + "(a steadier comparison than wall time on a shared machine)%n",
                        winnow.serviceCpuSeconds, winnow.clientCpuSeconds, winnow.serviceCpuSeconds / duck.cpuSeconds);
                if (!winnow.ingestTimings.isEmpty()) {
                    System.out.println("  ingest job phases (ms): " + winnow.ingestTimings);
                }
                System.out.printf(Locale.ROOT, "Winnow store %.0f MB while running (panel and the sort), %.0f MB with ten factors, "
                                + "%.0f MB after the revision, %.0f MB compacted, %.0f MB after shutdown; peak RSS %d MB (-Xmx%s)%n",
                        winnow.storeBytesRunning / 1e6, winnow.storeBytesTenFactors / 1e6, winnow.storeBytesRevised / 1e6,
                        winnow.storeBytesCompacted / 1e6, winnow.storeBytesClosed / 1e6, winnow.peakRssKb >> 10, xmx);
                System.out.printf(Locale.ROOT, "10-factor revision of the first date (%d rows): job %.2f s%s%n",
                        securities, winnow.revisionJobSeconds, winnow.revisionNote);
                System.out.printf(Locale.ROOT, "the same sort defined three times more after those builds (code compiled): build jobs %.2f, "
                                + "%.2f and %.2f s, median %.2f s, against %.2f s for the first build after the ingest (target under 1 s); "
                                + "the store after shutdown holds them too%n", winnow.warmBuildJobsSeconds[0], winnow.warmBuildJobsSeconds[1],
                        winnow.warmBuildJobsSeconds[2], winnow.warmBuildMedianSeconds(), winnow.buildJobSeconds);
                if (warmIngest) {
                    System.out.printf(Locale.ROOT, "the same file uploaded again to a second panel (code compiled): 202 after %.2f s, "
                                    + "ingest job %.2f s, against %.2f s for the first; phases (ms): %s (the store after shutdown "
                                    + "above holds both panels)%n", winnow.warmAcceptedSeconds, winnow.warmIngestJobSeconds,
                            winnow.ingestJobSeconds, winnow.warmIngestTimings);
                }
                System.out.printf(Locale.ROOT, "series check: %d dates in both, largest |Winnow - DuckDB| = %.3g%s%n",
                        commonDates(winnow.series, duck.series), maxDifference(winnow.series, duck.series),
                        winnow.series.size() == duck.series.size() ? "" : " (date counts differ: Winnow " + winnow.series.size()
                                + ", DuckDB " + duck.series.size() + ")");
                System.out.printf(Locale.ROOT, "RATIOS time Winnow/DuckDB = %.2f (target <= 0.75); store Winnow/DuckDB = %.2f "
                                + "(after shutdown %.2f; target <= 1.25); peak RSS %d MB (target <= 768)%n",
                        winnow.totalSeconds / duckSeconds, winnow.storeBytesRunning / (double) duck.fileBytes,
                        winnow.storeBytesClosed / (double) duck.fileBytes, winnow.peakRssKb >> 10);
            }
        } finally {
            deleteTree(dir);
        }
    }

    private record DuckResult(String version, double loadSeconds, double sortSeconds, double cpuSeconds, long fileBytes,
                              Map<LocalDate, Double> series) {
    }

    /** CPU seconds this process has used (all threads), or NaN where the JVM does not say. */
    private static double ownCpuSeconds() {
        java.lang.management.OperatingSystemMXBean os = java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        return os instanceof com.sun.management.OperatingSystemMXBean sun ? sun.getProcessCpuTime() / 1e9 : Double.NaN;
    }

    /** CPU seconds of this process's children that ended and were waited for (curl uploads), from /proc (Linux). */
    private static double reapedChildrenCpuSeconds() {
        try {
            String stat = Files.readString(Path.of("/proc/self/stat"));
            String[] fields = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
            return (Long.parseLong(fields[13]) + Long.parseLong(fields[14])) / 100.0; // cutime + cstime
        } catch (IOException | RuntimeException e) {
            return 0;
        }
    }

    /** CPU seconds (user + system) a process has used, from /proc (Linux; NaN elsewhere). */
    private static double processCpuSeconds(long pid) {
        try {
            String stat = Files.readString(Path.of("/proc/" + pid + "/stat"));
            String[] fields = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
            return (Long.parseLong(fields[11]) + Long.parseLong(fields[12])) / 100.0; // USER_HZ is 100 on Linux
        } catch (IOException | RuntimeException e) {
            return Double.NaN;
        }
    }

    private static DuckResult duckDb(Path csv, Path file) throws SQLException, IOException {
        Map<LocalDate, Double> series = new LinkedHashMap<>();
        String version;
        double load;
        double sort;
        double cpu;
        try (Connection c = DriverManager.getConnection("jdbc:duckdb:" + file.toAbsolutePath());
             Statement s = c.createStatement()) {
            try (ResultSet v = s.executeQuery("SELECT version()")) {
                v.next();
                version = v.getString(1);
            }
            double cpu0 = ownCpuSeconds();
            long t0 = System.nanoTime();
            s.execute("CREATE TABLE p AS SELECT * FROM read_csv('" + csv.toAbsolutePath().toString().replace("'", "''")
                    + "', header = true, columns = " + DUCK_COLUMNS + ")");
            long t1 = System.nanoTime();
            try (ResultSet rs = s.executeQuery(SORT_SQL)) {
                while (rs.next()) {
                    series.put(rs.getObject(1, LocalDate.class), rs.getDouble(2));
                }
            }
            long t2 = System.nanoTime();
            load = (t1 - t0) / 1e9;
            sort = (t2 - t1) / 1e9;
            cpu = ownCpuSeconds() - cpu0;
        }
        return new DuckResult(version, load, sort, cpu, directorySize(file.getParent(), file.getFileName().toString()), series);
    }

    private static final class WinnowResult {
        double acceptedSeconds;
        double ingestJobSeconds;
        double buildJobSeconds;
        /** The build jobs of the same sort defined three times more once the code is compiled. */
        final double[] warmBuildJobsSeconds = new double[3];
        double warmAcceptedSeconds;
        double warmIngestJobSeconds;
        Map<?, ?> warmIngestTimings;
        double totalSeconds;
        Map<?, ?> ingestTimings = Map.of();
        long storeBytesRunning;
        long storeBytesClosed;
        long storeBytesTenFactors;
        long storeBytesRevised;
        long storeBytesCompacted;
        long peakRssKb;
        double revisionJobSeconds;
        double serviceCpuSeconds;
        double clientCpuSeconds;
        String revisionNote = "";
        String client = "";
        Map<LocalDate, Double> series = new LinkedHashMap<>();

        /** The median of {@link #warmBuildJobsSeconds} (an odd count: the middle one once sorted). */
        double warmBuildMedianSeconds() {
            double[] sorted = warmBuildJobsSeconds.clone();
            java.util.Arrays.sort(sorted);
            return sorted[sorted.length / 2];
        }
    }

    private WinnowResult winnow(Path csv, Path dataDir, String xmx, long rows) throws Exception {
        WinnowResult result = new WinnowResult();
        Files.createDirectories(dataDir);
        int port = freePort();
        // a job's end is seen at most 50 ms late (twice in the timed part: the ingest and the build); polling every
        // 10 ms cost the service about 0.75 ms of CPU an answer, some 7% of a core while the ingest needs both
        http = new BenchClient(port, TOKEN, 50);
        Path log = dataDir.resolveSibling("winnow.log");
        List<String> command = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-Xmx" + xmx));
        command.addAll(SERVICE_JVM_ARGS);
        command.addAll(List.of("-jar", serviceJar().toString(), "serve"));
        ProcessBuilder pb = new ProcessBuilder(command);
        pb.environment().put("WINNOW_PORT", String.valueOf(port));
        pb.environment().put("WINNOW_DATA_DIR", dataDir.toString());
        pb.environment().put("WINNOW_ADMIN_TOKEN", TOKEN);
        pb.redirectErrorStream(true).redirectOutput(log.toFile());
        Process process = pb.start();
        try {
            awaitHealthy(process, log);
            double serviceCpu0 = processCpuSeconds(process.pid());
            double clientCpu0 = ownCpuSeconds() + reapedChildrenCpuSeconds();
            long t0 = System.nanoTime();
            String uploadJob = upload(port, "/v1/panels/" + PANEL + "/uploads", csv);
            result.client = CURL ? "curl" : "the JDK's HttpClient";
            result.acceptedSeconds = (System.nanoTime() - t0) / 1e9;
            JsonNode ingest = http.awaitJob(uploadJob);
            String buildJob = http.define("mom", SORT_DEFINITION);
            JsonNode build = http.awaitJob(buildJob);
            result.totalSeconds = (System.nanoTime() - t0) / 1e9;
            result.serviceCpuSeconds = processCpuSeconds(process.pid()) - serviceCpu0;
            result.clientCpuSeconds = ownCpuSeconds() + reapedChildrenCpuSeconds() - clientCpu0;
            result.ingestJobSeconds = BenchClient.jobSeconds(ingest);
            result.buildJobSeconds = BenchClient.jobSeconds(build);
            if (ingest.path("report").has("timings_ms")) {
                result.ingestTimings = JSON.convertValue(ingest.path("report").path("timings_ms"), Map.class);
            }
            if (ingest.path("rows_accepted").asLong() != rows) {
                throw new IllegalStateException("Winnow accepted " + ingest.path("rows_accepted") + " rows, expected " + rows);
            }
            result.storeBytesRunning = directorySize(dataDir, null);
            result.series = series("mom");

            List<String> jobs = new ArrayList<>();
            for (int i = 0; i < MORE_DEFINITIONS.length; i++) {
                jobs.add(http.define("f" + i, MORE_DEFINITIONS[i]));
            }
            for (String job : jobs) {
                http.awaitJob(job);
            }
            result.storeBytesTenFactors = directorySize(dataDir, null);
            Path revision = dataDir.resolveSibling("revision.csv");
            writeFirstDateRevision(csv, revision);
            JsonNode revise = http.awaitJob(upload(port, "/v1/panels/" + PANEL + "/uploads?mode=revise", revision));
            result.revisionJobSeconds = BenchClient.jobSeconds(revise);
            result.storeBytesRevised = directorySize(dataDir, null);
            // H2 keeps the pages that rewrites left behind until it is compacted (POST /v1/admin/compact)
            http.awaitJob(http.postForJob("/v1/admin/compact"));
            result.storeBytesCompacted = directorySize(dataDir, null);
            // the same sort three times more, one after another under other names, now that the service has built
            // eleven factors: the build of one sort with the construction and store code compiled, beside the first
            // (cold) build above; the median, since one build's time on a shared machine swings by a tenth of a second
            for (int i = 0; i < result.warmBuildJobsSeconds.length; i++) {
                result.warmBuildJobsSeconds[i] = BenchClient.jobSeconds(http.awaitJob(http.define("mom_again" + (i + 1), SORT_DEFINITION)));
            }
            if (warmIngest) {
                long w0 = System.nanoTime();
                String again = upload(port, "/v1/panels/" + PANEL + "_again/uploads", csv);
                result.warmAcceptedSeconds = (System.nanoTime() - w0) / 1e9;
                JsonNode ingestAgain = http.awaitJob(again);
                result.warmIngestJobSeconds = BenchClient.jobSeconds(ingestAgain);
                if (ingestAgain.path("report").has("timings_ms")) {
                    result.warmIngestTimings = JSON.convertValue(ingestAgain.path("report").path("timings_ms"), Map.class);
                }
            }
            JsonNode factors = revise.path("report").path("factors");
            result.revisionNote = String.format(Locale.ROOT, " (%d factors, first rebuilt_from %s, recomputed_dates %s)",
                    factors.size(), factors.path(0).path("rebuilt_from"), factors.path(0).path("recomputed_dates"));
            result.peakRssKb = peakRssKb(process.pid());
        } catch (Exception | Error e) {
            System.err.println("Winnow log:\n" + tail(log));
            throw e;
        } finally {
            process.destroy();
            if (!process.waitFor(120, java.util.concurrent.TimeUnit.SECONDS)) {
                process.destroyForcibly().waitFor();
            }
        }
        result.storeBytesClosed = directorySize(dataDir, null);
        return result;
    }

    /**
     * Sends the file as a CSV upload and returns the job id of the 202 answer: through curl when it is installed
     * (streaming the file, {@code -T}, as a user would upload), else through the JDK's HttpClient. Both run on this
     * machine's cores beside the service; curl costs far less CPU for the same bytes, so it disturbs the service less.
     */
    private String upload(int port, String path, Path file) throws IOException, InterruptedException {
        if (!CURL) {
            return http.upload(path, file);
        }
        Process curl = new ProcessBuilder("curl", "-sS", "-X", "POST", "-T", file.toString(), "-H", "Expect:",
                "-H", "Authorization: Bearer " + TOKEN, "-H", "Content-Type: text/csv", "-w", "\n%{http_code}",
                "http://127.0.0.1:" + port + path).redirectErrorStream(true).start();
        String out = new String(curl.getInputStream().readAllBytes(), StandardCharsets.UTF_8).trim();
        curl.waitFor();
        int cut = out.lastIndexOf('\n');
        String status = out.substring(cut + 1).trim();
        if (!status.equals("202")) {
            throw new IllegalStateException("expected 202 from the upload, got: " + out);
        }
        return JSON.readTree(out.substring(0, cut)).path("job").asText();
    }

    /** Whether curl can be run here. */
    private static final boolean CURL = curlAvailable();

    private static boolean curlAvailable() {
        if ("java".equals(System.getProperty("winnow.bench.client"))) {
            return false;
        }
        try {
            return new ProcessBuilder("curl", "--version").redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start().waitFor() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    /** The shaded service jar this benchmark was built with (it is on the class path as the winnow-service artifact). */
    private static Path serviceJar() throws URISyntaxException {
        return Path.of(dev.winnow.app.Main.class.getProtectionDomain().getCodeSource().getLocation().toURI());
    }

    /** A revision of the panel's first date: its rows with every present return raised by one basis point. */
    private static void writeFirstDateRevision(Path csv, Path revision) throws IOException {
        StringBuilder out = new StringBuilder();
        try (BufferedReader in = Files.newBufferedReader(csv, StandardCharsets.UTF_8)) {
            out.append(in.readLine()).append('\n');
            String first = null;
            for (String line = in.readLine(); line != null; line = in.readLine()) {
                String date = line.substring(0, line.indexOf(','));
                if (first == null) {
                    first = date;
                } else if (!first.equals(date)) {
                    break;
                }
                String[] cells = line.split(",", -1);
                if (!cells[2].isEmpty()) {
                    cells[2] = String.format(Locale.ROOT, "%.8f", Double.parseDouble(cells[2]) + 0.0001);
                }
                out.append(String.join(",", cells)).append('\n');
            }
        }
        Files.writeString(revision, out);
    }

    private Map<LocalDate, Double> series(String factor) throws Exception {
        HttpResponse<String> response = http.get("/v1/factors/" + factor + "/returns?format=csv");
        if (response.statusCode() != 200) {
            throw new IllegalStateException("returns of " + factor + " answered " + response.statusCode() + ": " + response.body());
        }
        Map<LocalDate, Double> series = new LinkedHashMap<>();
        String[] lines = response.body().split("\n");
        for (int i = 1; i < lines.length; i++) {
            String[] cells = lines[i].trim().split(",");
            series.put(LocalDate.parse(cells[0]), Double.parseDouble(cells[1]));
        }
        return series;
    }

    private static int commonDates(Map<LocalDate, Double> a, Map<LocalDate, Double> b) {
        int n = 0;
        for (LocalDate d : a.keySet()) {
            n += b.containsKey(d) ? 1 : 0;
        }
        return n;
    }

    private static double maxDifference(Map<LocalDate, Double> a, Map<LocalDate, Double> b) {
        double max = 0;
        for (Map.Entry<LocalDate, Double> e : a.entrySet()) {
            Double other = b.get(e.getKey());
            if (other != null) {
                max = Math.max(max, Math.abs(e.getValue() - other));
            }
        }
        return max;
    }

    private void awaitHealthy(Process process, Path log) throws Exception {
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        while (System.nanoTime() < deadline) {
            if (!process.isAlive()) {
                throw new IllegalStateException("the service exited: " + tail(log));
            }
            try {
                if (http.get("/health").statusCode() == 200) {
                    return;
                }
            } catch (IOException notYet) {
                // not listening yet
            }
            Thread.sleep(100);
        }
        throw new IllegalStateException("the service did not start: " + tail(log));
    }

    /** Peak resident set of a process in kB (VmHWM, Linux), or -1 where the figure is not available. */
    private static long peakRssKb(long pid) {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/" + pid + "/status"))) {
                if (line.startsWith("VmHWM:")) {
                    return Long.parseLong(line.substring(6).replace("kB", "").trim());
                }
            }
        } catch (IOException | RuntimeException e) {
            // not Linux
        }
        return -1;
    }

    private static int freePort() throws IOException {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }

    /** Bytes of the regular files under dir (only those whose name starts with {@code prefix}, when given). */
    private static long directorySize(Path dir, String prefix) throws IOException {
        try (var files = Files.walk(dir)) {
            return files.filter(Files::isRegularFile)
                    .filter(p -> prefix == null || p.getFileName().toString().startsWith(prefix))
                    .mapToLong(p -> p.toFile().length()).sum();
        }
    }

    private static String tail(Path log) {
        try {
            List<String> lines = Files.readAllLines(log);
            return String.join("\n", lines.subList(Math.max(0, lines.size() - 40), lines.size()));
        } catch (IOException e) {
            return "(no log)";
        }
    }

    private static void deleteTree(Path dir) throws IOException {
        try (var files = Files.walk(dir)) {
            files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        }
    }
}
