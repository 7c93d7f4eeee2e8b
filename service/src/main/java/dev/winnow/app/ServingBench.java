package dev.winnow.app;

import java.io.IOException;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.DayOfWeek;
import java.time.Duration;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Serving speed against a static web server in the same run ({@code java -jar winnow.jar bench serving}, also run at
 * the end of the full benchmark): the service on a temporary store holds a 300-point monthly series, ten
 * 6,300-point daily series and a 5-bucket sort over 300 months; for each measured request, the exact bytes it answers are written to a file that nginx
 * (two worker processes) serves, and {@code wrk -t2 -c64 -d10s} loads each over loopback, Winnow with the bearer
 * token, after the loading's jobs have finished and a garbage collection, a warm-up of 4 s per request (its rates
 * printed) and 3 s more right before each measurement. Reports requests per second, errors (socket errors and non-2xx answers) and the ratio Winnow / nginx.
 * Installs Debian's wrk and nginx-light with apt-get when they are missing and the process may (root).
 */
final class ServingBench {
    private static final String TOKEN = "bench-serving-token";
    private static final Pattern RPS = Pattern.compile("Requests/sec:\\s+([0-9.]+)");
    private static final Pattern NON_2XX = Pattern.compile("Non-2xx or 3xx responses:\\s+(\\d+)");
    private static final Pattern SOCKET = Pattern.compile("Socket errors: connect (\\d+), read (\\d+), write (\\d+), timeout (\\d+)");

    private final HttpClient client = HttpClient.newHttpClient();
    private int port;

    private ServingBench() {
    }

    record Result(double rps, long errors) {
    }

    static void run() throws Exception {
        if (!tool("wrk", "wrk") || !tool("nginx", "nginx-light")) {
            System.out.println("serving comparison skipped: wrk and nginx (Debian packages wrk, nginx-light) are needed");
            return;
        }
        new ServingBench().measure();
    }

    private void measure() throws Exception {
        Path dir = Files.createTempDirectory("winnow-serving");
        Process nginx = null;
        try {
            Path store = dir.resolve("store");
            // WINNOW_DB_URL names an empty PostgreSQL database (or schema) to measure there; else a temporary H2 store
            String dbUrl = System.getenv().getOrDefault("WINNOW_DB_URL", "").isBlank() ? Config.defaultH2Url(store) : System.getenv("WINNOW_DB_URL");
            try (Winnow winnow = Winnow.start(new Config(0, "127.0.0.1", store, dbUrl, TOKEN))) {
                port = winnow.port();
                SplittableRandom random = new SplittableRandom(300);
                List<LocalDate> months = new ArrayList<>();
                for (int i = 0; i < 300; i++) {
                    months.add(YearMonth.of(2000, 1).plusMonths(i).atEndOfMonth());
                }
                external("monthly", months, random);
                List<LocalDate> days = new ArrayList<>();
                LocalDate d = LocalDate.of(2000, 1, 3);
                for (int i = 0; i < 6300; i++) {
                    days.add(d);
                    d = d.getDayOfWeek() == DayOfWeek.FRIDAY ? d.plusDays(3) : d.plusDays(1);
                }
                List<String> daily = new ArrayList<>();
                for (int f = 0; f < 10; f++) {
                    daily.add("daily" + f);
                    external("daily" + f, days, random);
                }
                sortFactor("bucketed", months, random);
                String ten = String.join(",", daily);
                String[][] targets = {
                    // measured in this order: the first measurement after loading runs slower for every request
                    // (seen in several runs), so the two with targets come last
                    {"/v1/returns over 10 daily factors", "/v1/returns?factors=" + ten, null},
                    {"/summary of a daily factor", "/v1/factors/daily0/summary", null},
                    {"/v1/covariance of 10 daily factors", "/v1/covariance?factors=" + ten + "&half_life=126&nw_lags=2", null},
                    {"/portfolios of a 5-bucket monthly sort", "/v1/factors/bucketed/portfolios", null},
                    {"300-point monthly series", "/v1/factors/monthly/returns", "0.30"},
                    {"6,300-point daily series", "/v1/factors/daily0/returns", "0.50"},
                };
                Path root = Files.createDirectories(dir.resolve("www"));
                // nginx's workers run as an unprivileged user: the files must be readable by anyone
                Files.setPosixFilePermissions(dir, java.nio.file.attribute.PosixFilePermissions.fromString("rwxr-xr-x"));
                for (int i = 0; i < targets.length; i++) {
                    Files.write(root.resolve("t" + i), get(targets[i][1]));
                    Files.setPosixFilePermissions(root.resolve("t" + i), java.nio.file.attribute.PosixFilePermissions.fromString("rw-r--r--"));
                }
                int nginxPort = freePort();
                nginx = startNginx(dir, root, nginxPort);
                System.out.printf(Locale.ROOT, "serving: wrk -t2 -c64 -d10s on loopback; Winnow with a bearer token; nginx (2 workers) "
                        + "serving the identical bytes as a static file%n");
                // settle: the loading's garbage collected and the queue idle, so the first measurement does not pay for them
                awaitIdleQueue();
                System.gc();
                // warm-up: the JIT compiles the serving path before anything is measured; its rates are printed to
                // show how long the service takes to reach its pace after loading
                StringBuilder warm = new StringBuilder("  warm-up (4 s each, in order): req/s [JIT compile ms, GC ms of this JVM]:");
                for (String[] target : targets) {
                    long[] before = jvmTimes();
                    double rps = wrk("http://127.0.0.1:" + port + target[1], true, "4s").rps();
                    long[] after = jvmTimes();
                    warm.append(String.format(Locale.ROOT, " %.0f [%d, %d]", rps, after[0] - before[0], after[1] - before[1]));
                }
                System.out.println(warm);
                for (int i = 0; i < targets.length; i++) {
                    int bytes = (int) Files.size(root.resolve("t" + i));
                    wrk("http://127.0.0.1:" + port + targets[i][1], true, "3s"); // again right before, as nginx gets none
                    long[] before = jvmTimes();
                    Result ours = wrk("http://127.0.0.1:" + port + targets[i][1], true);
                    long[] after = jvmTimes();
                    Result theirs = wrk("http://127.0.0.1:" + nginxPort + "/t" + i, false);
                    double ratio = ours.rps() / theirs.rps();
                    String target = targets[i][2] == null ? "" : String.format(Locale.ROOT, " (target >= %.0f%%: %s)",
                            100 * Double.parseDouble(targets[i][2]),
                            ratio >= Double.parseDouble(targets[i][2]) && ours.errors() == 0 ? "met" : "NOT met");
                    System.out.printf(Locale.ROOT, "  %-38s %8d bytes: Winnow %8.0f req/s (%d errors), nginx %8.0f req/s (%d errors), ratio %.0f%%%s"
                                    + " [JIT %d ms, GC %d ms; load %s]%n",
                            targets[i][0], bytes, ours.rps(), ours.errors(), theirs.rps(), theirs.errors(), 100 * ratio, target,
                            after[0] - before[0], after[1] - before[1], loadAverage());
                }
            }
        } finally {
            if (nginx != null) {
                nginx.destroy();
                nginx.waitFor(10, TimeUnit.SECONDS);
            }
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /**
     * A panel of 40 securities over the months and a 5-bucket sort on its score, so that the factor stores its
     * five bucket portfolios (300 points each).
     */
    private void sortFactor(String name, List<LocalDate> months, SplittableRandom random) throws Exception {
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score\n");
        for (LocalDate month : months) {
            for (int s = 0; s < 40; s++) {
                csv.append(month).append(",B").append(s).append(',')
                        .append(String.format(Locale.ROOT, "%.6f,%.2f,%.4f", 0.05 * (random.nextDouble() - 0.5), 100 + 10 * s + random.nextDouble(),
                                random.nextDouble()))
                        .append('\n');
            }
        }
        awaitJob(send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/panels/bench/uploads"))
                .header("Content-Type", "text/csv").POST(HttpRequest.BodyPublishers.ofString(csv.toString()))), "panel bench");
        awaitJob(send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/factors/" + name))
                .header("Content-Type", "application/json").PUT(HttpRequest.BodyPublishers.ofString("{\"panel\":\"bench\",\"method\":\"sort\","
                        + "\"signal\":\"score\",\"buckets\":5,\"weighting\":\"equal\",\"rebalance\":\"monthly\",\"theme\":\"bench\","
                        + "\"rationale\":\"serving benchmark\"}"))), "factor " + name);
    }

    private String send(HttpRequest.Builder request) throws Exception {
        return client.send(request.header("Authorization", "Bearer " + TOKEN).build(), HttpResponse.BodyHandlers.ofString()).body();
    }

    /** Waits for the job a 202 answer names. */
    private void awaitJob(String accepted, String what) throws Exception {
        Matcher m = Pattern.compile("\"job\":\"?(\\d+)").matcher(accepted);
        if (!m.find()) {
            throw new IllegalStateException(what + " was not accepted: " + accepted);
        }
        while (true) {
            String state = new String(get("/v1/jobs/" + m.group(1)), StandardCharsets.UTF_8);
            if (state.contains("\"succeeded\"")) {
                return;
            }
            if (state.contains("\"failed\"")) {
                throw new IllegalStateException(what + " failed: " + state);
            }
            Thread.sleep(50);
        }
    }

    /** Waits until no job is queued or running (builds queued by the loading may still run in the background). */
    private void awaitIdleQueue() throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
        while (System.nanoTime() < deadline) {
            String health = new String(get("/health"), StandardCharsets.UTF_8);
            Matcher queued = Pattern.compile("\"(queued|running)\":(\\d+)").matcher(health);
            boolean busy = false;
            while (queued.find()) {
                busy |= !queued.group(2).equals("0");
            }
            if (!busy) {
                return;
            }
            Thread.sleep(200);
        }
    }

    /** Milliseconds this JVM has spent compiling (JIT) and collecting garbage so far. */
    private static long[] jvmTimes() {
        long gc = 0;
        for (var bean : java.lang.management.ManagementFactory.getGarbageCollectorMXBeans()) {
            gc += Math.max(0, bean.getCollectionTime());
        }
        var jit = java.lang.management.ManagementFactory.getCompilationMXBean();
        return new long[] {jit == null ? -1 : jit.getTotalCompilationTime(), gc};
    }

    /** The 1-minute load average of the machine, as /proc/loadavg gives it ("?" where there is none). */
    private static String loadAverage() {
        try {
            return Files.readString(Path.of("/proc/loadavg")).split(" ")[0];
        } catch (IOException | RuntimeException e) {
            return "?";
        }
    }

    private void external(String name, List<LocalDate> dates, SplittableRandom random) throws Exception {
        HttpRequest put = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/factors/" + name))
                .header("Authorization", "Bearer " + TOKEN).header("Content-Type", "application/json")
                .PUT(HttpRequest.BodyPublishers.ofString("{\"method\":\"external\"}")).build();
        client.send(put, HttpResponse.BodyHandlers.ofString());
        StringBuilder csv = new StringBuilder("date,return\n");
        for (LocalDate date : dates) {
            csv.append(date).append(',').append(String.format(Locale.ROOT, "%.8f", 0.0003 + 0.01 * (random.nextDouble() - 0.5))).append('\n');
        }
        HttpRequest upload = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/v1/factors/" + name + "/uploads"))
                .header("Authorization", "Bearer " + TOKEN).header("Content-Type", "text/csv")
                .POST(HttpRequest.BodyPublishers.ofString(csv.toString())).build();
        String job = client.send(upload, HttpResponse.BodyHandlers.ofString()).body().replaceAll("(?s).*\"job\":\"(\\d+)\".*", "$1");
        while (true) {
            String state = new String(get("/v1/jobs/" + job), StandardCharsets.UTF_8);
            if (state.contains("\"succeeded\"")) {
                return;
            }
            if (state.contains("\"failed\"")) {
                throw new IllegalStateException("upload of " + name + " failed: " + state);
            }
            Thread.sleep(50);
        }
    }

    private byte[] get(String path) throws Exception {
        HttpRequest request = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path))
                .header("Authorization", "Bearer " + TOKEN).timeout(Duration.ofSeconds(60)).GET().build();
        HttpResponse<byte[]> response = client.send(request, HttpResponse.BodyHandlers.ofByteArray());
        if (response.statusCode() != 200) {
            throw new IllegalStateException(path + " answered " + response.statusCode());
        }
        return response.body();
    }

    private static Process startNginx(Path dir, Path root, int port) throws Exception {
        Path conf = dir.resolve("nginx.conf");
        Files.createDirectories(dir.resolve("logs"));
        Files.writeString(conf, "worker_processes 2;\npid " + dir.resolve("nginx.pid") + ";\nerror_log " + dir.resolve("logs/error.log") + ";\n"
                + "events { worker_connections 1024; }\n"
                + "http {\n  access_log off;\n  sendfile on;\n  tcp_nopush on;\n  keepalive_requests 1000000;\n  default_type application/json;\n"
                + "  client_body_temp_path " + dir.resolve("tmp") + ";\n  proxy_temp_path " + dir.resolve("tmp") + ";\n"
                + "  server {\n    listen 127.0.0.1:" + port + ";\n    root " + root + ";\n  }\n}\n");
        Files.createDirectories(dir.resolve("tmp"));
        Process p = new ProcessBuilder(nginxPath(), "-p", dir.toString(), "-c", conf.toString(), "-g", "daemon off;")
                .redirectErrorStream(true).redirectOutput(dir.resolve("logs/stdout.log").toFile()).start();
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (System.nanoTime() < deadline) {
            try (var socket = new java.net.Socket("127.0.0.1", port)) {
                return p;
            } catch (IOException e) {
                Thread.sleep(50);
            }
        }
        p.destroy();
        throw new IllegalStateException("nginx did not start: " + Files.readString(dir.resolve("logs/stdout.log")));
    }

    private static String nginxPath() {
        for (String candidate : List.of("/usr/sbin/nginx", "/usr/bin/nginx")) {
            if (Files.isExecutable(Path.of(candidate))) {
                return candidate;
            }
        }
        return "nginx";
    }

    private static Result wrk(String url, boolean authenticated) throws Exception {
        return wrk(url, authenticated, "10s");
    }

    private static Result wrk(String url, boolean authenticated, String duration) throws Exception {
        List<String> command = new ArrayList<>(List.of("wrk", "-t2", "-c64", "-d" + duration));
        if (authenticated) {
            command.addAll(List.of("-H", "Authorization: Bearer " + TOKEN));
        }
        command.add(url);
        Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        p.waitFor();
        Matcher rps = RPS.matcher(out);
        if (!rps.find()) {
            throw new IllegalStateException("wrk printed no rate: " + out);
        }
        long errors = 0;
        Matcher non2xx = NON_2XX.matcher(out);
        if (non2xx.find()) {
            errors += Long.parseLong(non2xx.group(1));
        }
        Matcher socket = SOCKET.matcher(out);
        if (socket.find()) {
            for (int g = 1; g <= 4; g++) {
                errors += Long.parseLong(socket.group(g));
            }
        }
        return new Result(Double.parseDouble(rps.group(1)), errors);
    }

    private static int freePort() throws IOException {
        try (ServerSocket s = new ServerSocket(0)) {
            return s.getLocalPort();
        }
    }

    /** True when the command is on the PATH (or in /usr/sbin), after trying apt-get install when root and it is not. */
    private static boolean tool(String command, String debianPackage) throws Exception {
        if (onPath(command)) {
            return true;
        }
        if (!"root".equals(System.getProperty("user.name"))) {
            return false;
        }
        System.out.println("installing " + debianPackage + " with apt-get ...");
        Process p = new ProcessBuilder("sh", "-c", "apt-get install -y -qq " + debianPackage + " || (apt-get update -qq && apt-get install -y -qq " + debianPackage + ")")
                .inheritIO().start();
        p.waitFor();
        return onPath(command);
    }

    private static boolean onPath(String command) {
        if (command.equals("nginx") && Files.isExecutable(Path.of("/usr/sbin/nginx"))) {
            return true;
        }
        for (String dir : System.getenv().getOrDefault("PATH", "").split(":")) {
            if (Files.isExecutable(Path.of(dir, command))) {
                return true;
            }
        }
        return false;
    }
}
