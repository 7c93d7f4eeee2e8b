package dev.winnow.app;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.app.seed.SyntheticPanelWriter;

import java.io.IOException;
import java.io.RandomAccessFile;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

/**
 * The documented benchmark ({@code java -Xmx512m -jar winnow.jar bench [securities] [dates]}): generates a synthetic
 * daily panel, then drives a real service over HTTP on a temporary store and reports ingest rows per second, the build
 * time of one sort factor, the time to append one day to a panel with ten factors, the time to revise its last five
 * days, the cross-sectional studies ({@link CrossSectionBench}) and peak memory.
 * Job times are the worker's own (started to finished); upload times include sending the body over loopback.
 */
final class Bench {
    private static final String TOKEN = "bench-admin-token";

    private final HttpClient client = HttpClient.newHttpClient();
    private int port;
    private BenchClient http;

    private Bench() {
    }

    static void run(String[] args) throws Exception {
        if (args.length > 1 && args[1].equals("serving")) {
            ServingBench.run();
            return;
        }
        if (args.length > 1 && args[1].equals("cross-section")) {
            int securities = args.length > 2 ? Integer.parseInt(args[2]) : 3000;
            int dates = args.length > 3 ? Integer.parseInt(args[3]) : 6300;
            new Bench().crossSectionOnly(securities, dates);
            return;
        }
        int securities = args.length > 1 ? Integer.parseInt(args[1]) : 3000;
        int dates = args.length > 2 ? Integer.parseInt(args[2]) : 6300;
        new Bench().measure(securities, dates);
        ServingBench.run();
    }

    private void measure(int securities, int dates) throws Exception {
        Path dir = Files.createTempDirectory("winnow-bench");
        try {
            Path panel = dir.resolve("panel.csv");
            Path appendDay = dir.resolve("append.csv");
            System.out.printf(Locale.ROOT, "generating %d securities x %d dates (+1 day to append) ...%n", securities, dates);
            SyntheticPanelWriter.write(panel, securities, dates + 1, SyntheticPanelWriter.DEFAULT_SEED);
            splitLastDate(panel, appendDay);
            long rows = (long) securities * dates;
            System.out.printf(Locale.ROOT, "panel file %.0f MB, append file %.1f MB%n", Files.size(panel) / 1e6, Files.size(appendDay) / 1e6);

            Path store = dir.resolve("store");
            try (Winnow winnow = Winnow.start(new Config(0, "127.0.0.1", store, Config.defaultH2Url(store), TOKEN))) {
                port = winnow.port();
                http = new BenchClient(port, TOKEN, 100);
                resetPeaks();
                long t0 = System.nanoTime();
                JsonNode ingest = http.awaitJob(http.upload("/v1/panels/bench/uploads", panel));
                double uploadSeconds = (System.nanoTime() - t0) / 1e9;
                double ingestSeconds = BenchClient.jobSeconds(ingest);
                long heapIngest = peakHeap();
                report("ingest job", ingest);
                System.out.printf(Locale.ROOT, "ingest: %d rows, job %.1f s = %.0f rows/s (upload + job %.1f s), peak heap %d MB%n",
                        rows, ingestSeconds, rows / ingestSeconds, uploadSeconds, heapIngest >> 20);

                resetPeaks();
                JsonNode build = http.awaitJob(http.define("mom", "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\","
                        + "\"buckets\":5,\"weighting\":\"cap\",\"rebalance\":\"monthly\",\"cost_bps\":10}"));
                report("build job", build);
                System.out.printf(Locale.ROOT, "build of one sort factor (quintiles, cap-weighted, monthly, daily returns): %.2f s, peak heap %d MB%n",
                        BenchClient.jobSeconds(build), peakHeap() >> 20);

                resetPeaks();
                JsonNode buildDaily = http.awaitJob(http.define("mom_daily", "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\","
                        + "\"buckets\":5,\"weighting\":\"equal\"}"));
                System.out.printf(Locale.ROOT, "build of one sort factor rebalanced every day: %.2f s, peak heap %d MB%n",
                        BenchClient.jobSeconds(buildDaily), peakHeap() >> 20);

                signals(securities);

                String[] more = {
                    "{\"panel\":\"bench\",\"method\":\"market\"}",
                    "{\"panel\":\"bench\",\"method\":\"size_sort\",\"signal\":\"book_to_price\",\"rebalance\":\"monthly\"}",
                    "{\"panel\":\"bench\",\"method\":\"size_sort\",\"signal\":\"book_to_price\",\"output\":\"size\",\"rebalance\":\"monthly\"}",
                    "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"gross_profitability\",\"rebalance\":\"monthly\"}",
                    "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"asset_growth\",\"direction\":\"low_minus_high\",\"rebalance\":\"monthly\"}",
                    "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"noise_alpha\",\"rebalance\":\"quarterly\"}",
                    "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"book_to_price\",\"rebalance\":\"annual\",\"rebalance_month\":6,\"lag\":2}",
                    "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"noise_beta\",\"buckets\":10,\"weighting\":\"cap\",\"rebalance\":\"monthly\"}",
                };
                List<String> jobs = new ArrayList<>();
                for (int i = 0; i < more.length; i++) {
                    jobs.add(http.define("f" + i, more[i]));
                }
                for (String job : jobs) {
                    http.awaitJob(job);
                }

                resetPeaks();
                JsonNode append = http.awaitJob(http.upload("/v1/panels/bench/uploads", appendDay));
                report("append job", append);
                System.out.printf(Locale.ROOT, "append one day (%d rows) to the %d-date panel and extend 10 factors: job %.3f s, peak heap %d MB%n",
                        securities, dates, BenchClient.jobSeconds(append), peakHeap() >> 20);

                Path revision = dir.resolve("revision.csv");
                writeRevision(panel, appendDay, revision, 5);
                resetPeaks();
                JsonNode revise = http.awaitJob(http.upload("/v1/panels/bench/uploads?mode=revise", revision));
                report("revision job", revise);
                System.out.printf(Locale.ROOT, "revise the last 5 dates (%d rows) of the %d-date panel and bring 10 factors up to date "
                                + "(resumed from %s): job %.3f s, peak heap %d MB%n", 5L * securities, dates + 1,
                        revise.path("report").path("factors").get(0).path("rebuilt_from").asText(), BenchClient.jobSeconds(revise), peakHeap() >> 20);
                analytics(dates);
                new CrossSectionBench(http, winnow.jdbi()).run("bench", "mom");
                System.out.printf(Locale.ROOT, "store size on disk: %.0f MB%n", directorySize(store) / 1e6);
                System.out.printf(Locale.ROOT, "max heap (-Xmx) %d MB; peak resident set %s%n",
                        Runtime.getRuntime().maxMemory() >> 20, peakResidentSet());
            }
        } finally {
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /**
     * Only the cross-sectional figures ({@code bench cross-section [securities] [dates]}): generates and ingests the
     * panel, builds the one momentum sort factor whose signal the information coefficients read, then runs
     * {@link CrossSectionBench}.
     */
    private void crossSectionOnly(int securities, int dates) throws Exception {
        Path dir = Files.createTempDirectory("winnow-bench");
        try {
            Path panel = dir.resolve("panel.csv");
            System.out.printf(Locale.ROOT, "generating %d securities x %d dates ...%n", securities, dates);
            SyntheticPanelWriter.write(panel, securities, dates, SyntheticPanelWriter.DEFAULT_SEED);
            Path store = dir.resolve("store");
            try (Winnow winnow = Winnow.start(new Config(0, "127.0.0.1", store, Config.defaultH2Url(store), TOKEN))) {
                port = winnow.port();
                http = new BenchClient(port, TOKEN, 100);
                JsonNode ingest = http.awaitJob(http.upload("/v1/panels/bench/uploads", panel));
                System.out.printf(Locale.ROOT, "ingest: %d rows, job %.1f s%n", (long) securities * dates, BenchClient.jobSeconds(ingest));
                http.awaitJob(http.define("mom", "{\"panel\":\"bench\",\"method\":\"sort\",\"signal\":\"momentum_12_1\","
                        + "\"buckets\":5,\"weighting\":\"cap\",\"rebalance\":\"monthly\",\"cost_bps\":10}"));
                new CrossSectionBench(http, winnow.jdbi()).run("bench", "mom");
                System.out.printf(Locale.ROOT, "max heap (-Xmx) %d MB; peak resident set %s%n",
                        Runtime.getRuntime().maxMemory() >> 20, peakResidentSet());
            }
        } finally {
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /**
     * Signals built inside Winnow: one momentum factor on a recipe (the compounded return over t-251..t-21, the same
     * window as the panel's momentum_12_1 column) against the same factor on the column, a 24-variant momentum family
     * (3 lookbacks x 2 skips x 2 bucket counts x 2 weightings) built in one job against that one recipe factor, and the
     * recipe evaluation cost per row read through {@code GET /v1/panels/{panel}/signals}.
     */
    private void signals(int securities) throws Exception {
        resetPeaks();
        JsonNode recipe = http.awaitJob(http.define("mom_recipe", "{\"panel\":\"bench\",\"method\":\"sort\","
                + "\"signal\":{\"trailing_return\":{\"periods\":231,\"skip\":21}},\"buckets\":5,\"weighting\":\"cap\","
                + "\"rebalance\":\"monthly\",\"cost_bps\":10}"));
        double recipeSeconds = BenchClient.jobSeconds(recipe);
        System.out.printf(Locale.ROOT, "build of the same sort factor on a recipe (trailing_return 231, skip 21): %.2f s, peak heap %d MB%n",
                recipeSeconds, peakHeap() >> 20);
        resetPeaks();
        JsonNode family = http.awaitJob(http.declareFamily("momfam", "{\"base\":{\"panel\":\"bench\",\"method\":\"sort\","
                + "\"signal\":{\"trailing_return\":{\"periods\":231,\"skip\":21}},\"rebalance\":\"monthly\"},"
                + "\"vary\":{\"signal.trailing_return.periods\":[105,168,231],\"signal.trailing_return.skip\":[0,21],"
                + "\"buckets\":[5,10],\"weighting\":[\"equal\",\"cap\"]}}"));
        double familySeconds = BenchClient.jobSeconds(family);
        System.out.printf(Locale.ROOT, "build of a 24-variant momentum family in one job: %.2f s = %.2f x the one recipe factor "
                + "(target under 4 x), peak heap %d MB%n", familySeconds, familySeconds / recipeSeconds, peakHeap() >> 20);
        String signal = java.net.URLEncoder.encode("{\"zscore\":{\"trailing_return\":{\"periods\":231,\"skip\":21}}}",
                java.nio.charset.StandardCharsets.UTF_8);
        String column = "/v1/panels/bench/signals?signal=momentum_12_1";
        String path = "/v1/panels/bench/signals?signal=" + signal;
        double columnMillis = medianMillis(column);
        double recipeMillis = medianMillis(path);
        long rowsRead = 252L * securities;
        System.out.printf(Locale.ROOT, "signal values at the last date over HTTP: column %.1f ms; zscore(trailing_return 231 skip 21) "
                + "%.1f ms, reading 252 dates = %.0f ns per row read (decoding included)%n", columnMillis, recipeMillis,
                recipeMillis * 1e6 / rowsRead);
        // retired, so that the append and revision figures below extend the same ten factors as before
        http.delete("/v1/families/momfam");
        http.delete("/v1/factors/mom_recipe");
    }

    /**
     * Uploads 50 external daily series of {@code dates} business days and times, over HTTP, the 50x50 correlation
     * matrix and rolling significance with a 252-day window (median of 20 requests after 5 warm-up requests).
     */
    private void analytics(int dates) throws Exception {
        java.util.SplittableRandom random = new java.util.SplittableRandom(50);
        List<String> names = new ArrayList<>();
        for (int f = 0; f < 50; f++) {
            String name = "ext" + f;
            names.add(name);
            HttpRequest put = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/factors/" + name))
                    .header("Authorization", "Bearer " + TOKEN).header("Content-Type", "application/json")
                    .PUT(HttpRequest.BodyPublishers.ofString("{\"method\":\"external\"}")).build();
            client.send(put, HttpResponse.BodyHandlers.ofString());
            StringBuilder csv = new StringBuilder("date,return\n");
            java.time.LocalDate d = java.time.LocalDate.of(2000, 1, 3);
            for (int t = 0; t < dates; t++) {
                csv.append(d).append(',').append(String.format(Locale.ROOT, "%.6f", 0.0002 + 0.01 * (random.nextDouble() - 0.5))).append('\n');
                d = d.getDayOfWeek() == java.time.DayOfWeek.FRIDAY ? d.plusDays(3) : d.plusDays(1);
            }
            Path file = Files.createTempFile("series", ".csv");
            Files.writeString(file, csv);
            http.awaitJob(http.upload("/v1/factors/" + name + "/uploads", file));
            Files.delete(file);
        }
        String matrix = "/v1/correlations?factors=" + String.join(",", names);
        System.out.printf(Locale.ROOT, "50x50 correlation matrix over %d daily dates: median %.1f ms over HTTP%n", dates, medianMillis(matrix));
        System.out.printf(Locale.ROOT, "rolling significance, window 252, %d daily dates: median %.1f ms over HTTP%n", dates,
                medianMillis("/v1/factors/ext0/significance?window=252"));
    }

    private double medianMillis(String path) throws Exception {
        double[] times = new double[20];
        for (int i = -5; i < times.length; i++) {
            HttpRequest request = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path))
                    .header("Authorization", "Bearer " + TOKEN).GET().build();
            long t0 = System.nanoTime();
            HttpResponse<byte[]> response = client.send(request, HttpResponse.BodyHandlers.ofByteArray());
            if (response.statusCode() != 200) {
                throw new IllegalStateException(path + " answered " + response.statusCode());
            }
            if (i >= 0) {
                times[i] = (System.nanoTime() - t0) / 1e6;
            }
        }
        java.util.Arrays.sort(times);
        return (times[9] + times[10]) / 2;
    }

    /** Moves the rows of the file's last date into a file of their own, with the header. */
    private static void splitLastDate(Path panel, Path appendDay) throws IOException {
        String header;
        try (var reader = Files.newBufferedReader(panel)) {
            header = reader.readLine();
        }
        try (RandomAccessFile file = new RandomAccessFile(panel.toFile(), "rw")) {
            long length = file.length();
            int tail = (int) Math.min(length, 8L << 20);
            byte[] bytes = new byte[tail];
            file.seek(length - tail);
            file.readFully(bytes);
            String text = new String(bytes, StandardCharsets.UTF_8);
            String lastLine = text.substring(text.lastIndexOf('\n', text.length() - 2) + 1);
            String lastDate = lastLine.substring(0, lastLine.indexOf(','));
            int start = text.indexOf('\n' + lastDate + ',') + 1;
            Files.writeString(appendDay, header + "\n" + text.substring(start));
            file.setLength(length - tail + start);
        }
    }

    /**
     * Writes a revision of the panel's last {@code count} dates: the last {@code count - 1} dates of the panel file
     * (read from its tail) and the appended day, every present return raised by one basis point.
     */
    private static void writeRevision(Path panel, Path appendDay, Path revision, int count) throws IOException {
        List<String> appended = Files.readAllLines(appendDay);
        String header = appended.get(0);
        List<String> lines = new ArrayList<>();
        try (RandomAccessFile file = new RandomAccessFile(panel.toFile(), "r")) {
            long length = file.length();
            int tail = (int) Math.min(length, count * Files.size(appendDay) + (1 << 20));
            byte[] bytes = new byte[tail];
            file.seek(length - tail);
            file.readFully(bytes);
            String[] tailLines = new String(bytes, StandardCharsets.UTF_8).split("\n");
            List<String> tailDates = new ArrayList<>();
            for (int i = tailLines.length - 1; i > 0; i--) { // the first line may be cut
                String date = tailLines[i].substring(0, tailLines[i].indexOf(','));
                if (!tailDates.contains(date)) {
                    if (tailDates.size() == count - 1) {
                        break;
                    }
                    tailDates.add(date);
                }
                lines.add(0, tailLines[i]);
            }
        }
        lines.addAll(appended.subList(1, appended.size()));
        StringBuilder out = new StringBuilder(header).append('\n');
        for (String line : lines) {
            String[] cells = line.split(",", -1);
            if (!cells[2].isEmpty()) {
                cells[2] = String.format(Locale.ROOT, "%.8f", Double.parseDouble(cells[2]) + 0.0001);
            }
            out.append(String.join(",", cells)).append('\n');
        }
        Files.writeString(revision, out);
    }

    private static void report(String what, JsonNode job) {
        System.out.println("  " + what + " report: " + job.path("report"));
    }

    private static void resetPeaks() {
        System.gc();
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            pool.resetPeakUsage();
        }
    }

    /** Sum of the heap pools' peaks since the last reset (includes garbage not yet collected). */
    private static long peakHeap() {
        long sum = 0;
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                sum += pool.getPeakUsage().getUsed();
            }
        }
        return sum;
    }

    private static String peakResidentSet() {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/self/status"))) {
                if (line.startsWith("VmHWM:")) {
                    return line.substring(6).trim();
                }
            }
        } catch (IOException | RuntimeException e) {
            // not Linux: no figure
        }
        return "unknown";
    }

    private static long directorySize(Path dir) throws IOException {
        try (var files = Files.walk(dir)) {
            return files.filter(Files::isRegularFile).mapToLong(p -> p.toFile().length()).sum();
        }
    }
}
