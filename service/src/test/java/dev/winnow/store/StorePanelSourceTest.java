package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A panel read through {@link PanelStore#source} gives, at every date, the cross-section that a read of that date
 * alone ({@link PanelStore#slice}) gives, bit for bit: read in order (blocks read ahead), in a jumping order (blocks
 * read ahead and abandoned, earlier blocks read again), after the read-ahead threads were closed (every block read on
 * the caller's thread), and with a column filter (the columns left out read as missing, the others unchanged).
 */
class StorePanelSourceTest {
    private static final int DATES = 5 * StorePanelSource.BLOCK - 7;
    private static final LocalDate START = LocalDate.of(2032, 3, 1);

    @TempDir
    Path dir;
    private TestDatabase store;
    private Database database;
    private PanelStore panels;
    private long panelId;

    @BeforeEach
    void open() {
        store = TestDatabase.fresh(dir, "jdbc:h2:file:" + dir.resolve("store").toAbsolutePath());
        database = Database.open(store.url());
        panels = TestDatabase.panels(database.jdbi());
        panelId = panels.createPanelIfAbsent("reads");
        long uploadId = panels.beginUpload(panelId, new JobStore(database.jdbi()).enqueue(JobKind.PANEL_UPLOAD, "{}"), "append");
        SecurityDictionary dictionary = panels.securityDictionary(panelId, uploadId);
        for (int id = 1; id <= 40; id++) {
            assertEquals(id, dictionary.idFor("CO-" + id));
        }
        Random random = new Random(20321);
        for (int d = 0; d < DATES; d++) {
            panels.stageSlice(panelId, uploadId, section(START.plusDays(d), random));
        }
        panels.commitUpload(panelId, uploadId, Map.of("signal", "number", "sector", "label"));
    }

    @AfterEach
    void close() {
        database.close();
        store.close();
    }

    /** A date's rows: a changing subset of 40 securities with random values, some of them missing. */
    private static CrossSection section(LocalDate date, Random random) {
        List<Integer> ids = new ArrayList<>();
        for (int id = 1; id <= 40; id++) {
            if (random.nextInt(5) > 0) {
                ids.add(id);
            }
        }
        int n = ids.size();
        double[] returns = new double[n];
        double[] caps = new double[n];
        double[] signal = new double[n];
        String[] sector = new String[n];
        for (int i = 0; i < n; i++) {
            returns[i] = random.nextInt(10) == 0 ? Double.NaN : random.nextGaussian() * 0.02;
            caps[i] = Math.exp(random.nextGaussian() * 2 + 6);
            signal[i] = random.nextInt(8) == 0 ? Double.NaN : random.nextDouble() - 0.5;
            sector[i] = random.nextInt(8) == 0 ? null : "S" + random.nextInt(4);
        }
        return new CrossSection(date, ids.stream().mapToInt(Integer::intValue).toArray(), returns, caps,
                Map.of("signal", signal), Map.of("sector", sector));
    }

    private void assertSameAsAlone(CrossSection read, int index, boolean withColumns) {
        CrossSection alone = panels.slice(panelId, START.plusDays(index));
        assertEquals(alone.date(), read.date());
        assertArrayEquals(alone.securityIds(), read.securityIds(), "ids at " + index);
        assertTrue(Arrays.equals(alone.returns(), read.returns()), "returns at " + index);
        assertTrue(Arrays.equals(alone.marketCaps(), read.marketCaps()), "caps at " + index);
        double[] missing = new double[alone.size()];
        Arrays.fill(missing, Double.NaN);
        assertTrue(Arrays.equals(withColumns ? alone.numberColumn("signal") : missing, read.numberColumn("signal")),
                "signal at " + index);
        assertArrayEquals(withColumns ? alone.labelColumn("sector") : new String[alone.size()], read.labelColumn("sector"),
                "sector at " + index);
    }

    @Test
    void readInOrderEachDateIsTheDateReadAlone() {
        StorePanelSource source = panels.source(panelId);
        assertEquals(DATES, source.dates().size());
        for (int t = 0; t < DATES; t++) {
            assertSameAsAlone(source.crossSection(t), t, true);
        }
    }

    @Test
    void readInAJumpingOrderEachDateIsTheDateReadAlone() {
        StorePanelSource source = panels.source(panelId);
        Random order = new Random(7);
        for (int k = 0; k < 3 * DATES; k++) {
            // mostly forward steps (read ahead used), sometimes a jump either way (read ahead abandoned)
            int t = order.nextInt(4) == 0 ? order.nextInt(DATES) : Math.min(DATES - 1, k % DATES);
            assertSameAsAlone(source.crossSection(t), t, true);
        }
    }

    @Test
    void withTheReadAheadThreadsClosedTheCallerReadsEveryBlock() {
        PanelReadAhead closed = new PanelReadAhead(1);
        closed.close();
        StorePanelSource source = new PanelStore(database.jdbi(), closed).source(panelId);
        for (int t = 0; t < DATES; t++) {
            assertSameAsAlone(source.crossSection(t), t, true);
        }
    }

    @Test
    void aColumnLeftOutReadsAsMissingAndTheRestIsUnchanged() {
        StorePanelSource source = panels.source(panelId, name -> false);
        for (int t = 0; t < DATES; t++) {
            assertSameAsAlone(source.crossSection(t), t, false);
        }
    }
}
