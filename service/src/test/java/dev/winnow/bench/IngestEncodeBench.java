package dev.winnow.bench;

import com.sun.management.OperatingSystemMXBean;
import dev.winnow.construct.CrossSection;
import dev.winnow.ingest.CrossSectionSink;
import dev.winnow.ingest.PanelParseResult;
import dev.winnow.ingest.PanelUpload;
import dev.winnow.ingest.PanelUploadParser;
import dev.winnow.ingest.UploadMode;
import dev.winnow.store.CrossSectionCodec;
import dev.winnow.store.SliceDecimals;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;

/**
 * The ingest job's CPU work without HTTP or the store: parses a panel CSV (the comparison's, kept in its
 * {@code --work} folder) with the one-pass parser and encodes every slice as the stager would, with the parser's
 * decimal forms or, with {@code --no-forms}, finding them by trial, then decodes each payload again as a build reads
 * it (every column). Prints per run the wall time, the process's CPU seconds (all threads: parse workers, reader, the
 * hand-over, encoding and decoding on this thread), the encoding's and the decoding's share, and the decoding's CPU
 * nanoseconds per number.
 * Not a unit test; run by hand:
 *
 * <pre>
 *   mvn -q -B -o test-compile
 *   java -Xmx512m -cp "service/target/classes:service/target/test-classes:&lt;the service's dependency class path&gt;" \
 *        dev.winnow.bench.IngestEncodeBench /tmp/wbench/panel-3000x6300.csv [--runs=4] [--no-forms]
 * </pre>
 */
public final class IngestEncodeBench {

    private IngestEncodeBench() {
    }

    public static void main(String[] args) throws Exception {
        Path file = Path.of(args[0]);
        int runs = 4;
        boolean forms = true;
        for (int i = 1; i < args.length; i++) {
            if (args[i].startsWith("--runs=")) {
                runs = Integer.parseInt(args[i].substring("--runs=".length()));
            } else if (args[i].equals("--no-forms")) {
                forms = false;
            } else {
                throw new IllegalArgumentException("usage: IngestEncodeBench CSV [--runs=N] [--no-forms]");
            }
        }
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        OperatingSystemMXBean os = ManagementFactory.getPlatformMXBean(OperatingSystemMXBean.class);
        for (int run = 0; run < runs; run++) {
            Map<String, Integer> ids = new HashMap<>();
            long[] encode = {0, 0};
            long[] decode = {0, 0};
            boolean useForms = forms;
            CrossSectionSink sink = new CrossSectionSink() {
                @Override
                public void accept(CrossSection cs) {
                    accept(cs, null);
                }

                @Override
                public void accept(CrossSection cs, SliceDecimals decimals) {
                    long t = threads.getCurrentThreadCpuTime();
                    byte[] payload = CrossSectionCodec.encode(cs, useForms ? decimals : null);
                    long t1 = threads.getCurrentThreadCpuTime();
                    CrossSection back = CrossSectionCodec.decode(cs.date(), payload);
                    long t2 = threads.getCurrentThreadCpuTime();
                    encode[1] += payload.length;
                    encode[0] += t1 - t;
                    decode[0] += t2 - t1;
                    decode[1] += (long) back.size() * (2 + back.numbers().size());
                }

                @Override
                public void discardAccepted() {
                    encode[1] = 0;
                }
            };
            long cpu0 = os.getProcessCpuTime();
            long t0 = System.nanoTime();
            PanelParseResult result = new PanelUploadParser().parse(
                    new PanelUpload(file, false, UploadMode.APPEND, null, Map.of()),
                    code -> ids.computeIfAbsent(code, c -> ids.size() + 1), sink, progress -> { });
            long wall = System.nanoTime() - t0;
            long cpu = os.getProcessCpuTime() - cpu0;
            System.out.printf("run %d: %,d rows (%d errors), wall %.2f s, CPU %.2f s, of it encoding %.2f s, decoding %.2f s"
                            + " (%.2f ns a number), %,d payload bytes%n", run + 1, result.rowsAccepted(), result.errorCount(),
                    wall / 1e9, cpu / 1e9, encode[0] / 1e9, decode[0] / 1e9, decode[0] / (double) Math.max(1, decode[1]), encode[1]);
        }
    }
}
