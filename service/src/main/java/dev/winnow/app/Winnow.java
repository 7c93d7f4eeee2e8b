package dev.winnow.app;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.api.ApiServer;
import dev.winnow.api.Authenticator;
import dev.winnow.api.Health;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.store.ChangeFeed;
import dev.winnow.jobs.JobHandler;
import dev.winnow.jobs.JobParams;
import dev.winnow.store.JobKind;
import dev.winnow.jobs.JobQueue;
import dev.winnow.jobs.JobResources;
import dev.winnow.jobs.JobWorker;
import dev.winnow.construct.FormingThreads;
import dev.winnow.research.Breadth;
import dev.winnow.research.FactorBuilds;
import dev.winnow.research.FactorDefinitions;
import dev.winnow.research.FactorEvidence;
import dev.winnow.research.FactorLibrary;
import dev.winnow.research.FactorPortfolios;
import dev.winnow.research.PortfolioRiskStudy;
import dev.winnow.research.FamaMacBethStudy;
import dev.winnow.research.StudyThreads;
import dev.winnow.research.InformationCoefficients;
import dev.winnow.research.ModelTests;
import dev.winnow.research.SeriesNames;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.research.LoadingsService;
import dev.winnow.research.Families;
import dev.winnow.research.FactorHoldings;
import dev.winnow.research.SignalPreview;
import dev.winnow.research.Themes;
import dev.winnow.research.TrialLibrary;
import dev.winnow.store.Database;
import dev.winnow.store.PostgresChangeFeed;
import dev.winnow.store.LocalChangeFeed;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FamilyStore;
import dev.winnow.store.JobStore;
import dev.winnow.store.JsonText;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.PanelReadAhead;
import dev.winnow.store.PanelStore;
import dev.winnow.store.TokenStore;
import io.javalin.Javalin;
import org.jdbi.v3.core.Jdbi;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.io.IOException;
import java.nio.file.Files;
import java.util.Map;

/** One running service: store, recovery, job worker and HTTP server, wired together. */
public final class Winnow implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(Winnow.class);

    private final ServiceMetrics metrics;
    private final Database database;
    private final ChangeFeed changes;
    private final Jdbi jdbi;
    private final JobWorker worker;
    private final Javalin http;
    private final JobQueue queue;
    private final String generatedAdminToken;
    private final DemoLoader demo;
    private final StudyThreads studyThreads;
    private final PanelReadAhead readAhead;
    private final FormingThreads forming;

    private Winnow(Config config) throws IOException {
        requireWritable(config.dataDir());
        this.metrics = new ServiceMetrics();
        this.database = openStore(config, metrics);
        this.jdbi = database.jdbi();
        boolean embedded = database.dialect() == Database.Dialect.H2;
        // one process on the embedded store; on PostgreSQL every instance hears the others' commits
        this.changes = embedded ? new LocalChangeFeed() : PostgresChangeFeed.start(database);
        TokenStore tokens = new TokenStore(jdbi, changes);
        JobStore jobs = new JobStore(jdbi);
        this.readAhead = PanelReadAhead.perProcessor();
        this.forming = FormingThreads.perProcessor();
        PanelStore panels = new PanelStore(jdbi, readAhead);
        FactorStore factors = new FactorStore(jdbi, changes);
        metrics.watchQueue(jobs);
        metrics.watchSeriesCache(factors);
        LoadingsStore loadings = new LoadingsStore(jdbi);
        UploadSpool spool = new UploadSpool(config.dataDir(), config.limits(), embedded ? null : new dev.winnow.store.SpoolStore(jdbi));

        if (embedded) {
            // the embedded store is this process's alone (its file lock refuses a second one), so whatever is
            // staged or running was left by a crash; on a shared store those belong to other instances, and a dead
            // worker's jobs come back when their leases expire
            int discarded = panels.discardAllStaging();
            int requeued = jobs.requeueInterrupted();
            if (discarded + requeued > 0) {
                LOG.info("recovered from an interrupted run: {} staged upload(s) discarded, {} job(s) queued again", discarded, requeued);
            }
        }
        this.generatedAdminToken = bootstrapAdmin(tokens, config.adminToken());

        this.queue = new JobQueue(jobs, new JobResources(factors, panels));
        int removed = removeOrphanedSpoolFiles(jobs, spool);
        if (removed > 0) {
            LOG.info("removed {} spooled upload(s) that were never acknowledged", removed);
        }
        int rebuilds = requeueOrphanedBuilds(factors, jobs, queue);
        if (rebuilds > 0) {
            LOG.info("queued {} factor build(s) whose job was lost in an interrupted run", rebuilds);
        }
        FactorDefinitions definitions = new FactorDefinitions(factors, panels, queue);
        FactorBuilds builds = new FactorBuilds(panels, factors, forming);
        LoadingsRefresh loadingsRefresh = new LoadingsRefresh(panels, factors, loadings);
        Map<JobKind, JobHandler> handlers = JobHandlers.create(panels, factors, builds, loadingsRefresh, spool, database);
        Config.Instance instance = config.instance();
        this.worker = instance.role().runsJobs()
                ? new JobWorker(jobs, handlers, new JobWorker.Settings(workerName(), instance.workerThreads(), instance.leaseSeconds()),
                        metrics.jobObserver())
                : null;
        this.demo = new DemoLoader(panels, factors, jobs, queue, spool, definitions);
        Breadth breadth = new Breadth(panels, factors, forming);
        TrialLibrary library = new TrialLibrary(factors);
        Families families = new Families(new FamilyStore(jdbi), factors, definitions, queue, library);
        this.studyThreads = StudyThreads.perProcessor();
        SeriesNames seriesNames = new SeriesNames(factors);
        LoadingsService loadingsService = new LoadingsService(panels, factors, loadings, queue);
        FactorLibrary factorLibrary = new FactorLibrary(factors, seriesNames);
        this.http = ApiServer.create(new ApiServer.Dependencies(tokens, jobs, panels, factors, queue, spool, definitions,
                library, new FactorEvidence(factors, breadth), breadth, new Themes(factors),
                loadingsService, new SignalPreview(panels, factors),
                new FamaMacBethStudy(panels, factors, studyThreads), new ModelTests(seriesNames), new FactorPortfolios(factors),
                new InformationCoefficients(panels, factors, studyThreads), () -> health(jobs, spool), new FactorHoldings(builds, panels), families,
                factorLibrary, new PortfolioRiskStudy(loadingsService, factorLibrary)), config.bind(), config.port(),
                new ApiServer.Serving(instance.role().servesApi(), metrics.registry(), metrics::scrape, instance.metricsPublic()));
    }

    /** The store answers a read and the data directory keeps its free-space floor; the worker is alive and not stuck. */
    private Health health(JobStore jobs, UploadSpool spool) {
        JobStore.QueueCounts queue = null;
        String store;
        try {
            queue = jobs.queueCounts();
            store = spool.hasMinimumFreeSpace() ? "ok" : "low_space";
        } catch (RuntimeException e) {
            store = "unavailable";
        }
        if (worker == null) { // WINNOW_ROLE=api: the jobs run on worker instances
            String status = store.equals("unavailable") ? "unavailable" : store.equals("low_space") ? "degraded" : "ok";
            return new Health(status, store, "none", queue);
        }
        JobWorker.State state = worker.state();
        if (state == JobWorker.State.WAITING_FOR_STORE) {
            store = "unavailable";
        }
        boolean workerServes = state == JobWorker.State.IDLE || state == JobWorker.State.RUNNING;
        String status = store.equals("unavailable") || !workerServes ? "unavailable" : store.equals("low_space") ? "degraded" : "ok";
        return new Health(status, store, state.name().toLowerCase(java.util.Locale.ROOT), queue);
    }

    /** The data directory cannot be created or written; Main prints the message as one line and exits 1. */
    public static final class DataDirectoryNotWritableException extends IllegalStateException {
        DataDirectoryNotWritableException(String message) {
            super(message);
        }
    }

    /** Creates the data directory if needed and proves it can be written, before the store opens there. */
    private static void requireWritable(java.nio.file.Path dir) {
        try {
            Files.createDirectories(dir);
            java.nio.file.Path probe = Files.createTempFile(dir, ".write-check", ".tmp");
            Files.delete(probe);
        } catch (IOException | SecurityException e) {
            String why = e instanceof java.nio.file.AccessDeniedException ? "permission denied"
                    : e instanceof java.nio.file.FileSystemException fse && fse.getReason() != null ? fse.getReason()
                    : e.getClass().getSimpleName();
            throw new DataDirectoryNotWritableException("cannot write to the data directory " + dir + " (" + why
                    + "); set WINNOW_DATA_DIR to a directory this user can write");
        }
    }

    public static Winnow start(Config config) throws IOException {
        Winnow w = new Winnow(config);
        if (w.worker != null) {
            w.worker.start(w.queue);
        }
        w.http.start();
        return w;
    }

    /** Opens the store; an embedded store that another process holds is refused with one line naming the directory. */
    private static Database openStore(Config config, ServiceMetrics metrics) {
        try {
            return Database.open(config.dbUrl(), config.dbPool(), metrics.registry());
        } catch (RuntimeException e) {
            if (Database.isEmbeddedStoreInUse(e)) {
                throw new StoreInUseException("the store in " + config.dataDir() + " is in use by another Winnow process; "
                        + "the embedded store serves one process at a time (stop the other, or run several on PostgreSQL)");
            }
            throw e;
        }
    }

    /** The embedded store is open in another process. */
    public static final class StoreInUseException extends RuntimeException {
        StoreInUseException(String message) {
            super(message);
        }
    }

    /** This process's name in the job table: host, process id and a random suffix, unique among instances. */
    private static String workerName() {
        String host;
        try {
            host = java.net.InetAddress.getLocalHost().getHostName();
        } catch (java.net.UnknownHostException e) {
            host = "unknown-host";
        }
        String name = host + "/" + ProcessHandle.current().pid() + "/" + Long.toHexString(new java.security.SecureRandom().nextLong() & 0xffffffL);
        return name.length() > 100 ? name.substring(name.length() - 100) : name;
    }

    /**
     * An upload body is spooled before its job is queued and acknowledged; a crash between the two leaves a file no
     * job refers to. Runs before the server starts, so no upload is in flight.
     */
    private static int removeOrphanedSpoolFiles(JobStore jobs, UploadSpool spool) throws IOException {
        java.util.Set<String> referenced = new java.util.HashSet<>();
        for (JobKind kind : java.util.List.of(JobKind.PANEL_UPLOAD, JobKind.SERIES_UPLOAD)) {
            for (JobStore.JobRecord job : jobs.unfinished(kind)) {
                referenced.add(((JobParams.Upload) JobParams.of(job)).file());
            }
        }
        return spool.removeUnreferenced(referenced);
    }

    /**
     * A definition is stored before its build job is queued; a crash between the two would leave the version
     * 'building' for ever. Queues a build for every such version that has no queued build job.
     */
    private static int requeueOrphanedBuilds(FactorStore factors, JobStore jobs, JobQueue queue) {
        java.util.Set<String> queued = new java.util.HashSet<>();
        for (JobStore.JobRecord job : jobs.unfinished(JobKind.FACTOR_BUILD)) {
            JobParams.FactorBuild params = JobParams.of(job, JobParams.FactorBuild.class);
            queued.add(params.factor() + "#" + params.version());
        }
        for (JobStore.JobRecord job : jobs.unfinished(JobKind.FAMILY_BUILD)) {
            for (JobParams.FamilyBuild.Member v : JobParams.of(job, JobParams.FamilyBuild.class).versions()) {
                queued.add(v.factor() + "#" + v.version());
            }
        }
        int count = 0;
        for (FactorStore.FactorVersionRecord v : factors.allVersions()) {
            if (v.status() == VersionStatus.BUILDING && v.method() != FactorDefinition.Method.EXTERNAL && !queued.contains(v.name() + "#" + v.version())) {
                queue.queueFactorBuild(v.name(), v.version());
                count++;
            }
        }
        return count;
    }

    /**
     * With WINNOW_ADMIN_TOKEN set, that token is the admin token named "admin". Otherwise, when no admin exists,
     * a new one is made; only its hash is stored and the token itself is returned to be printed once.
     */
    private static String bootstrapAdmin(TokenStore tokens, String configured) {
        try {
            return bootstrapAdminOnce(tokens, configured);
        } catch (RuntimeException e) {
            // another instance starting at the same moment inserted it first: what it stored is what we wanted
            return bootstrapAdminOnce(tokens, configured);
        }
    }

    private static String bootstrapAdminOnce(TokenStore tokens, String configured) {
        if (configured != null) {
            String hash = Authenticator.hash(configured);
            if (tokens.all().stream().noneMatch(t -> t.tokenHash().equals(hash))) {
                tokens.delete("admin");
                tokens.insert("admin", "admin", hash);
            }
            return null;
        }
        if (tokens.anyWithScope("admin")) {
            return null;
        }
        String token = Authenticator.newToken();
        tokens.insert("admin", "admin", Authenticator.hash(token));
        return token;
    }

    /**
     * Loads the demo scenario when the store is empty; returns the factor names it defined, or an empty list when
     * the store already held data.
     */
    public java.util.List<String> loadDemoIfEmpty() throws Exception {
        if (!demo.storeIsEmpty()) {
            return java.util.List.of();
        }
        return demo.load();
    }

    public int port() {
        return http.port();
    }

    public Jdbi jdbi() {
        return jdbi;
    }

    /** The admin token created at this start, or null when one was configured or already existed. */
    public String generatedAdminToken() {
        return generatedAdminToken;
    }

    @Override
    public void close() {
        http.stop();
        if (worker != null) {
            worker.close();
        }
        if (changes instanceof AutoCloseable closeable) {
            try {
                closeable.close();
            } catch (Exception e) {
                LOG.warn("could not close the change feed: {}", e.getMessage());
            }
        }
        studyThreads.close();
        forming.close();
        readAhead.close();
        database.close();
        metrics.close();
    }
}
