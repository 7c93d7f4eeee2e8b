package dev.winnow.bench;

import dev.winnow.ingest.UploadSpool;
import java.io.*;
import java.nio.file.*;
import java.util.zip.GZIPOutputStream;
/** Hand-run: the cost of counting the decoded bytes of a gzip upload while spooling it, against a plain JDK gunzip of the same body. */
public final class SpoolBench {
    public static void main(String[] a) throws Exception {
        StringBuilder sb = new StringBuilder("date,security,return,market_cap,score\n");
        java.util.Random r = new java.util.Random(1);
        while (sb.length() < 150_000_000) {
            sb.append("2024-01-").append(10 + r.nextInt(20)).append(",S").append(r.nextInt(3000)).append(',')
              .append(r.nextGaussian() * 0.02).append(',').append(100 + r.nextInt(10000)).append(',').append(r.nextDouble()).append('\n');
        }
        byte[] raw = sb.toString().getBytes();
        ByteArrayOutputStream z = new ByteArrayOutputStream();
        try (GZIPOutputStream g = new GZIPOutputStream(z, 1 << 16)) { g.write(raw); }
        byte[] gz = z.toByteArray();
        Path dir = Files.createTempDirectory("spoolbench");
        UploadSpool spool = new UploadSpool(dir, new dev.winnow.store.Limits(1L << 40, 0));
        System.out.printf("raw %d MB, gzip %d MB%n", raw.length >> 20, gz.length >> 20);
        for (int rep = 0; rep < 3; rep++) {
            long t0 = System.nanoTime();
            var s1 = spool.write(new ByteArrayInputStream(gz), gz.length, false);
            long t1 = System.nanoTime();
            var s2 = spool.write(new ByteArrayInputStream(gz), gz.length, true);
            long t2 = System.nanoTime();
            spool.delete(s1.relativePath()); spool.delete(s2.relativePath());
            long t3 = System.nanoTime();
            long n = 0;
            try (var in = new java.util.zip.GZIPInputStream(new ByteArrayInputStream(gz), 1 << 16)) {
                byte[] buf = new byte[1 << 16];
                for (int k; (k = in.read(buf)) >= 0; ) n += k;
            }
            System.out.printf("plain JDK gunzip of the same body (peer): %.0f ms%n", (System.nanoTime() - t3) / 1e6);
            System.out.printf("gzip body spooled without counting: %.0f ms; counting decoded bytes: %.0f ms (ratio %.1f)%n",
                (t1 - t0) / 1e6, (t2 - t1) / 1e6, (double) (t2 - t1) / (t1 - t0));
        }
    }
}
