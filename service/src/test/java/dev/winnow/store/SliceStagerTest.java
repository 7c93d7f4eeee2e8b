package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

import java.nio.file.Path;
import java.time.LocalDate;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The background staging writer on a real store with a pool of two connections (the parser's thread and the
 * writer's): discarding while the writer is busy, then staging afresh, stages exactly what was accepted since; a
 * writer that fails is reported to the parser's side instead of being waited on. The timeouts only turn a hang
 * (the bug these tests were written for: a writer that stopped early left its stop marker to the next writer, which
 * then exited at once and the parser waited forever) into a failure; they time nothing.
 */
class SliceStagerTest {
    @TempDir
    Path dir;
    private TestDatabase store;
    private Database database;
    private PanelStore panels;
    private long panelId;
    private long uploadId;

    @BeforeEach
    void open() {
        store = TestDatabase.fresh(dir, "jdbc:h2:file:" + dir.resolve("store").toAbsolutePath());
        database = Database.open(store.url(), 2, null);
        panels = TestDatabase.panels(database.jdbi());
        long jobId = new JobStore(database.jdbi()).enqueue(JobKind.PANEL_UPLOAD, "{}");
        panelId = panels.createPanelIfAbsent("stager");
        uploadId = panels.beginUpload(panelId, jobId, "append");
    }

    @AfterEach
    void close() {
        database.close();
        store.close();
    }

    private static CrossSection slice(LocalDate date, int rows) {
        int[] ids = new int[rows];
        double[] returns = new double[rows];
        double[] caps = new double[rows];
        for (int i = 0; i < rows; i++) {
            ids[i] = i + 1;
            returns[i] = (i % 7 - 3) * 0.001;
            caps[i] = 100 + i;
        }
        return new CrossSection(date, ids, returns, caps, Map.of(), Map.of());
    }

    private long stagedRows() {
        return database.jdbi().withHandle(h -> h.createQuery("SELECT COUNT(*) FROM panel_slices WHERE upload_id = :u")
                .bind("u", uploadId).mapTo(Long.class).one());
    }

    @Test
    @Timeout(120)
    void discardingWhileTheWriterIsBusyAndStagingAgainStagesExactlyWhatFollowed() throws Exception {
        LocalDate start = LocalDate.of(2031, 1, 1);
        try (SliceStager stager = panels.stager(panelId, uploadId)) {
            for (int round = 0; round < 40; round++) {
                // more than the queue holds, so the writer is mid-slice when the discard comes
                for (int d = 0; d < 40 + round; d++) {
                    stager.accept(slice(start.plusDays(d), 50));
                }
                stager.discardStaged();
            }
            int last = 75;
            for (int d = 0; d < last; d++) {
                stager.accept(slice(start.plusDays(d), 50));
            }
            SliceStager.Stats stats = stager.finish();
            assertEquals(last, stats.slices());
        }
        assertEquals(75, stagedRows());
    }

    @Test
    @Timeout(120)
    void aWriterThatFailsIsReportedToTheParserInsteadOfWaitedOn() {
        LocalDate date = LocalDate.of(2031, 1, 1);
        try (SliceStager stager = panels.stager(panelId, uploadId)) {
            // the same date twice in one upload breaks the slices' primary key in the writer's transaction
            RuntimeException failure = assertThrows(RuntimeException.class, () -> {
                for (int i = 0; i < 1000; i++) {
                    stager.accept(slice(date, 10));
                }
                stager.finish();
            });
            assertTrue(failure.getMessage() != null && !failure.getMessage().isBlank(), failure.toString());
        }
    }
}
