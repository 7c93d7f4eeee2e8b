package dev.winnow.app;

import dev.winnow.store.H2Url;
import dev.winnow.store.Limits;

import java.nio.file.Path;
import java.util.Map;

/**
 * Service configuration, read from the environment in one place.
 *
 * @param port       WINNOW_PORT (default 8080; 0 picks a free port)
 * @param bind       WINNOW_BIND (default 127.0.0.1)
 * @param dataDir    WINNOW_DATA_DIR (default ./data): the H2 file and spooled uploads
 * @param dbUrl      WINNOW_DB_URL (default an H2 file under the data dir)
 * @param adminToken WINNOW_ADMIN_TOKEN: bootstrap admin token, or null
 * @param instance   how this instance shares the store with others (pool, role, worker threads, leases, metrics)
 * @param limits     WINNOW_MAX_UPLOAD_BYTES, WINNOW_MIN_FREE_BYTES and the fixed limits (see {@link Limits})
 */
public record Config(int port, String bind, Path dataDir, String dbUrl, String adminToken, Instance instance, Limits limits) {

    /** What this process does: serve the API, run jobs, or both. */
    public enum Role {
        /** API and worker (the default). */
        ALL,
        /** Serves the API, never runs jobs. */
        API,
        /** Runs jobs; serves only /health and /metrics. */
        WORKER;

        public boolean servesApi() {
            return this != WORKER;
        }

        public boolean runsJobs() {
            return this != API;
        }

        static Role parse(String text) {
            return switch (text.trim().toLowerCase(java.util.Locale.ROOT)) {
                case "all" -> ALL;
                case "api" -> API;
                case "worker" -> WORKER;
                default -> throw new IllegalArgumentException("WINNOW_ROLE must be all, api or worker, got '" + text + "'");
            };
        }
    }

    /**
     * @param dbPool        WINNOW_DB_POOL (default 16): the most connections the pool opens to the store
     * @param role          WINNOW_ROLE (default all)
     * @param workerThreads WINNOW_WORKER_THREADS (default 1): jobs this instance runs at once
     * @param leaseSeconds  WINNOW_JOB_LEASE_S (default 30): how long a claimed job stays with a worker that stops
     *                      renewing it before another worker may claim it
     * @param metricsPublic WINNOW_METRICS_PUBLIC (default false): /metrics without a token
     */
    public record Instance(int dbPool, Role role, int workerThreads, int leaseSeconds, boolean metricsPublic) {
        public static final Instance DEFAULT = new Instance(dev.winnow.store.Database.DEFAULT_POOL_SIZE, Role.ALL, 1, 30, false);

        public Instance withRole(Role r) {
            return new Instance(dbPool, r, workerThreads, leaseSeconds, metricsPublic);
        }

        public Instance withWorkerThreads(int n) {
            return new Instance(dbPool, role, n, leaseSeconds, metricsPublic);
        }

        public Instance withLeaseSeconds(int s) {
            return new Instance(dbPool, role, workerThreads, s, metricsPublic);
        }

        public Instance withMetricsPublic(boolean open) {
            return new Instance(dbPool, role, workerThreads, leaseSeconds, open);
        }
    }

    /** A configuration with the defaults for everything not named. */
    public Config(int port, String bind, Path dataDir, String dbUrl, String adminToken) {
        this(port, bind, dataDir, dbUrl, adminToken, Instance.DEFAULT, Limits.DEFAULTS);
    }

    /** The same configuration on another store. */
    public Config withDbUrl(String url) {
        return new Config(port, bind, dataDir, url, adminToken, instance, limits);
    }

    /** The same configuration with other instance settings. */
    public Config withInstance(Instance other) {
        return new Config(port, bind, dataDir, dbUrl, adminToken, other, limits);
    }

    /** The same configuration with other limits. */
    public Config withLimits(Limits newLimits) {
        return new Config(port, bind, dataDir, dbUrl, adminToken, instance, newLimits);
    }

    public int dbPool() {
        return instance.dbPool();
    }

    public static Config fromEnvironment(Map<String, String> env) {
        Path dataDir = Path.of(env.getOrDefault("WINNOW_DATA_DIR", "data")).toAbsolutePath();
        int parsedPort = wholeNumber(env, "WINNOW_PORT", 8080, 0, 65535);
        String dbUrl = env.get("WINNOW_DB_URL");
        if (dbUrl == null || dbUrl.isBlank()) {
            dbUrl = defaultH2Url(dataDir);
        }
        dbUrl = H2Url.durable(dbUrl.trim());
        String token = env.get("WINNOW_ADMIN_TOKEN");
        Instance instance = new Instance(
                wholeNumber(env, "WINNOW_DB_POOL", Instance.DEFAULT.dbPool(), 1, 1000),
                Role.parse(env.getOrDefault("WINNOW_ROLE", "all")),
                wholeNumber(env, "WINNOW_WORKER_THREADS", Instance.DEFAULT.workerThreads(), 1, 64),
                wholeNumber(env, "WINNOW_JOB_LEASE_S", Instance.DEFAULT.leaseSeconds(), 3, 86_400),
                flag(env, "WINNOW_METRICS_PUBLIC"));
        Limits limits = new Limits(
                bytes(env, "WINNOW_MAX_UPLOAD_BYTES", Limits.DEFAULTS.maxUploadBytes()),
                bytes(env, "WINNOW_MIN_FREE_BYTES", Limits.DEFAULTS.minFreeBytes()));
        return new Config(parsedPort, env.getOrDefault("WINNOW_BIND", "127.0.0.1"), dataDir, dbUrl,
                token == null || token.isBlank() ? null : token, instance, limits);
    }

    private static long bytes(Map<String, String> env, String variable, long defaultValue) {
        String text = env.get(variable);
        return text == null || text.isBlank() ? defaultValue : Limits.parseBytes(variable, text);
    }

    /** A true/false setting, false when unset. */
    static boolean flag(Map<String, String> env, String name) {
        String text = env.get(name);
        if (text == null || text.isBlank()) {
            return false;
        }
        return switch (text.trim().toLowerCase(java.util.Locale.ROOT)) {
            case "true" -> true;
            case "false" -> false;
            default -> throw new IllegalArgumentException(name + " must be true or false, got '" + text + "'");
        };
    }

    /** A whole-number setting from {@code min} to {@code max}, or its default when unset. */
    static int wholeNumber(Map<String, String> env, String name, int fallback, int min, int max) {
        String text = env.get(name);
        if (text == null || text.isBlank()) {
            return fallback;
        }
        int value;
        try {
            value = Integer.parseInt(text.trim());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(name + " must be a whole number from " + min + " to " + max + ", got '" + text + "'");
        }
        if (value < min || value > max) {
            throw new IllegalArgumentException(name + " must be a whole number from " + min + " to " + max + ", got " + value);
        }
        return value;
    }

    /**
     * H2 file store. WRITE_DELAY=0 writes every commit to the file at once (H2 otherwise flushes up to 500 ms later,
     * so a killed process could lose an acknowledged upload; {@link H2Url#durable} adds it to operators' URLs too);
     * FILE_LOCK=FS lets a second process fail clearly; DB_CLOSE_ON_EXIT=FALSE leaves closing the store to the
     * service's own shutdown (HTTP, then the worker, then the store), instead of H2's shutdown hook closing it under a
     * worker still asking for jobs (a stack trace in the log at every Ctrl-C).
     */
    public static String defaultH2Url(Path dataDir) {
        return "jdbc:h2:file:" + dataDir.resolve("winnow").toAbsolutePath() + ";FILE_LOCK=FS;WRITE_DELAY=0;DB_CLOSE_ON_EXIT=FALSE";
    }

    public Path spoolDir() {
        return dataDir.resolve("spool");
    }
}
