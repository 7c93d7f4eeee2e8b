package dev.winnow.bench;

import dev.winnow.ingest.PanelParseResult;
import dev.winnow.ingest.PanelUpload;
import dev.winnow.ingest.PanelUploadParser;
import dev.winnow.ingest.ProgressListener;
import dev.winnow.ingest.SecurityIds;
import dev.winnow.ingest.UploadMode;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.Map;
import java.util.Random;

/**
 * Parse-only throughput of panel uploads: writes a synthetic daily panel (invented securities, 4 numeric
 * characteristics and 1 label) to a temp file, then times the first pass alone and both passes with a sink that
 * drops everything, reporting rows/s by wall clock and by the parsing thread's CPU time (steadier on a shared
 * machine), and peak heap as the sum of the heap pools' peak usage (an upper bound that includes garbage not yet
 * collected). Not a unit test; run by hand with a small heap, e.g.
 *
 * <pre>
 *   mvn -q -B -o test-compile
 *   java -Xmx512m -cp service/target/classes:service/target/test-classes dev.winnow.bench.IngestParseBench \
 *        [securities=3000] [dates=1000] [--security-major] [--full-precision] [--runs=2]
 * </pre>
 *
 * {@code --security-major} writes each security's whole history before the next security, so every date is spread
 * over the file and the second pass takes the chunked path. {@code --full-precision} writes shortest round-trip
 * decimals (up to 17 significant digits) instead of 6 decimal places.
 */
public final class IngestParseBench {

    private static final String[] SECTORS = {"Energy", "Materials", "Industrials", "Utilities", "Health Care",
        "Financials", "Information Technology", "Real Estate"};

    private IngestParseBench() {
    }

    public static void main(String[] args) throws Exception {
        int securities = 3000;
        int dates = 1000;
        boolean securityMajor = false;
        boolean fullPrecision = false;
        int runs = 2;
        int positional = 0;
        for (String arg : args) {
            if (arg.equals("--security-major")) {
                securityMajor = true;
            } else if (arg.equals("--full-precision")) {
                fullPrecision = true;
            } else if (arg.startsWith("--runs=")) {
                runs = Integer.parseInt(arg.substring("--runs=".length()));
            } else if (positional++ == 0) {
                securities = Integer.parseInt(arg);
            } else {
                dates = Integer.parseInt(arg);
            }
        }
        Path file = Files.createTempFile("winnow-bench", ".csv");
        try {
            long start = System.nanoTime();
            long rows = writePanel(file, securities, dates, securityMajor, fullPrecision);
            System.out.printf("wrote %,d rows (%,d securities x %,d dates, %s, %s), %,d bytes in %.1f s%n", rows,
                    securities, dates, securityMajor ? "security-major" : "date-major",
                    fullPrecision ? "full precision" : "6 decimals", Files.size(file), seconds(start));
            System.out.printf("max heap %,d MB%n", Runtime.getRuntime().maxMemory() >> 20);
            PanelUpload upload = new PanelUpload(file, false, UploadMode.APPEND, null, Map.of());
            for (int run = 1; run <= runs; run++) {
                time("run " + run + " pass 1 only  ", rows, () -> new PanelUploadParser().validate(upload,
                        ProgressListener.NONE));
                time("run " + run + " both passes  ", rows, () -> new PanelUploadParser().parse(upload,
                        new CountingIds(), crossSection -> { }, ProgressListener.NONE));
            }
        } finally {
            Files.deleteIfExists(file);
        }
    }

    private interface Parse {
        PanelParseResult run() throws Exception;
    }

    private static void time(String label, long rows, Parse parse) throws Exception {
        System.gc();
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            pool.resetPeakUsage();
        }
        long cpuStart = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
        long start = System.nanoTime();
        PanelParseResult result = parse.run();
        double elapsed = seconds(start);
        double cpu = (ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() - cpuStart) / 1e9;
        if (!result.accepted()) {
            throw new IllegalStateException("benchmark upload rejected: " + result.errors());
        }
        long peak = 0;
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                peak += pool.getPeakUsage().getUsed();
            }
        }
        System.out.printf("%s wall %6.2f s %,11.0f rows/s | thread cpu %6.2f s %,11.0f rows/s | peak heap %,4d MB%n",
                label, elapsed, rows / elapsed, cpu, rows / cpu, peak >> 20);
    }

    private static long writePanel(Path file, int securities, int dates, boolean securityMajor,
                                   boolean fullPrecision) throws IOException {
        LocalDate[] days = new LocalDate[dates];
        LocalDate day = LocalDate.of(2000, 1, 3);
        for (int d = 0; d < dates; d++) {
            days[d] = day;
            day = day.plusDays(day.getDayOfWeek().getValue() == 5 ? 3 : 1);
        }
        Random random = new Random(42);
        long rows = 0;
        try (Writer out = new BufferedWriter(new OutputStreamWriter(Files.newOutputStream(file),
                StandardCharsets.UTF_8), 1 << 16)) {
            out.write("date,security,return,market_cap,size,value,momentum,beta,sector\n");
            StringBuilder line = new StringBuilder(160);
            int outer = securityMajor ? securities : dates;
            int inner = securityMajor ? dates : securities;
            for (int o = 0; o < outer; o++) {
                for (int i = 0; i < inner; i++) {
                    int s = securityMajor ? o : i;
                    int d = securityMajor ? i : o;
                    line.setLength(0);
                    line.append(days[d]).append(",FICT").append(s).append(',');
                    number(line, random.nextGaussian() * 0.02, fullPrecision).append(',');
                    number(line, 1e8 * (1 + (s % 997)), fullPrecision).append(',');
                    for (int c = 0; c < 4; c++) {
                        number(line, random.nextGaussian(), fullPrecision).append(',');
                    }
                    line.append(SECTORS[s % SECTORS.length]).append('\n');
                    out.append(line);
                    rows++;
                }
            }
        }
        return rows;
    }

    /** Appends a value with 6 decimal places, or its shortest round-trip form. */
    private static StringBuilder number(StringBuilder out, double value, boolean fullPrecision) {
        if (fullPrecision) {
            return out.append(value);
        }
        long micros = Math.round(value * 1e6);
        if (micros < 0) {
            out.append('-');
            micros = -micros;
        }
        out.append(micros / 1_000_000).append('.');
        String fraction = Long.toString(micros % 1_000_000);
        out.append("000000", 0, 6 - fraction.length()).append(fraction);
        return out;
    }

    /** Ids in order of first appearance, as a store would hand them out. */
    private static final class CountingIds implements SecurityIds {
        private final Map<String, Integer> ids = new HashMap<>();

        @Override
        public int idFor(String code) {
            return ids.computeIfAbsent(code, c -> ids.size());
        }
    }

    private static double seconds(long startNanos) {
        return (System.nanoTime() - startNanos) / 1e9;
    }
}
