package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.stats.ReturnSeries;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Random;

/**
 * A temporary H2 store with a generated panel of invented securities and factors, for loadings tests and the
 * loadings benchmark. Returns follow r = a + sum_j b_j f_j + e; a few returns and rows are missing.
 */
public final class LoadingsTestStore implements AutoCloseable {
    private final Path dir;
    private final TestDatabase store;
    private final Database database;
    public final PanelStore panels;
    public final FactorStore factors;
    public final LoadingsStore loadings;
    public final JobStore jobs;

    public LoadingsTestStore() {
        try {
            dir = Files.createTempDirectory("winnow-loadings");
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        store = TestDatabase.fresh(dir, "jdbc:h2:file:" + dir.resolve("store").toAbsolutePath());
        database = Database.open(store.url());
        panels = TestDatabase.panels(database.jdbi());
        factors = new FactorStore(database.jdbi());
        loadings = new LoadingsStore(database.jdbi());
        jobs = new JobStore(database.jdbi());
    }

    /** Weekdays from {@code start}. */
    public static List<LocalDate> weekdays(LocalDate start, int count) {
        List<LocalDate> days = new ArrayList<>();
        for (LocalDate d = start; days.size() < count; d = d.plusDays(1)) {
            if (d.getDayOfWeek() != DayOfWeek.SATURDAY && d.getDayOfWeek() != DayOfWeek.SUNDAY) {
                days.add(d);
            }
        }
        return days;
    }

    /** Generated factor returns, {@code [factor][date]}, about 1% a period. */
    public static double[][] factorReturns(long seed, int factorCount, int dates) {
        Random random = new Random(seed);
        double[][] f = new double[factorCount][dates];
        for (double[] row : f) {
            for (int t = 0; t < dates; t++) {
                row[t] = 0.01 * random.nextGaussian();
            }
        }
        return f;
    }

    /**
     * Generated cross-sections of {@code securities} securities (ids 1..n in code order) at the given grid indices of
     * {@code dates}: about 2% of returns missing and security {@link #lateSecurity} without rows in the first fifth of the dates.
     */
    public static List<CrossSection> slices(long seed, int securities, List<LocalDate> dates, double[][] factors, int from, int to) {
        Random random = new Random(seed);
        double[][] betas = new double[securities][factors.length];
        double[] noise = new double[securities];
        for (int i = 0; i < securities; i++) {
            for (int j = 0; j < factors.length; j++) {
                betas[i][j] = 1.0 / (j + 1) + 0.5 * random.nextGaussian();
            }
            noise[i] = 0.005 + 0.02 * random.nextDouble();
        }
        List<CrossSection> slices = new ArrayList<>();
        for (int t = from; t <= to; t++) {
            Random day = new Random(seed * 1_000_003L + t);
            int late = t < dates.size() / 5 ? lateSecurity(securities) : -1;
            int count = late >= 0 ? securities - 1 : securities;
            int[] ids = new int[count];
            double[] returns = new double[count];
            double[] caps = new double[count];
            double[] size = new double[count];
            int row = 0;
            for (int i = 0; i < securities; i++) {
                double r = 0.0002 + noise[i] * day.nextGaussian();
                for (int j = 0; j < factors.length; j++) {
                    r += betas[i][j] * factors[j][t];
                }
                boolean missing = day.nextDouble() < 0.02;
                double cap = Math.exp(20 + 2 * day.nextGaussian());
                if (i + 1 == late) {
                    continue;
                }
                ids[row] = i + 1;
                returns[row] = missing ? Double.NaN : r;
                caps[row] = cap;
                size[row] = Math.log(cap);
                row++;
            }
            slices.add(new CrossSection(dates.get(t), ids, returns, caps, Map.of("log_size", size), Map.of()));
        }
        return slices;
    }

    /** The security that enters the generated panel late. */
    public static int lateSecurity(int securities) {
        return securities / 2 + 1;
    }

    public static String code(int id) {
        return String.format("ACME-%04d", id);
    }

    /** Uploads slices (security codes from {@link #code}) and commits them; returns the panel id. */
    public long upload(String panel, int securities, List<CrossSection> slices, boolean newColumn) {
        long panelId = panels.createPanelIfAbsent(panel);
        long jobId = jobs.enqueue(dev.winnow.store.JobKind.PANEL_UPLOAD, "{}");
        long uploadId = panels.beginUpload(panelId, jobId, "append");
        SecurityDictionary dictionary = panels.securityDictionary(panelId, uploadId);
        for (int i = 1; i <= securities; i++) {
            if (dictionary.idFor(code(i)) != i) {
                throw new IllegalStateException("security ids must follow the codes' order");
            }
        }
        for (CrossSection cs : slices) {
            panels.stageSlice(panelId, uploadId, cs);
        }
        panels.commitUpload(panelId, uploadId, newColumn ? Map.of("log_size", "number") : Map.of());
        return panelId;
    }

    /** Defines a factor and stores a build of the given returns (NaN leaves a date out); returns its name. */
    public String factor(String name, List<LocalDate> dates, double[] values) {
        FactorStore.FactorVersionRecord v = factors.define(name, "{\"test\":\"" + name + "\"}", dev.winnow.construct.FactorDefinition.Method.EXTERNAL, null).version();
        factors.saveBuild(v.factorId(), v.version(), returns(dates, values, 0), List.of(), null, "{}", false, null);
        return name;
    }

    /** Appends (replaceFrom null) or revises (replaceFrom set) a factor's series, as a rebuild would. */
    public void extendFactor(String name, List<LocalDate> dates, double[] values, int from, LocalDate replaceFrom) {
        FactorStore.FactorVersionRecord v = factors.current(name).orElseThrow();
        factors.saveBuild(v.factorId(), v.version(), returns(dates, values, from), List.of(), null, "{}", replaceFrom == null, replaceFrom);
    }

    private static List<FactorStore.StoredReturn> returns(List<LocalDate> dates, double[] values, int from) {
        List<FactorStore.StoredReturn> out = new ArrayList<>();
        for (int t = from; t < values.length; t++) {
            if (!Double.isNaN(values[t])) {
                out.add(new FactorStore.StoredReturn(dates.get(t), values[t], Double.NaN, Double.NaN, Double.NaN));
            }
        }
        return out;
    }

    public ReturnSeries series(String name) {
        FactorStore.FactorVersionRecord v = factors.current(name).orElseThrow();
        return factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD);
    }

    public static double[] prefix(double[] values, int length) {
        return Arrays.copyOf(values, length);
    }

    @Override
    public void close() {
        database.close();
        store.close();
        try (var files = Files.walk(dir)) {
            files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
