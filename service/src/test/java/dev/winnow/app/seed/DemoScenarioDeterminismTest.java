package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.YearMonth;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Same seed, same bytes: the demo generator and the benchmark panel writer are reproducible. */
class DemoScenarioDeterminismTest {

    private static final DemoScenarioGenerator.Config SMALL =
            new DemoScenarioGenerator.Config(40, YearMonth.of(2010, 1), 48, 99L);

    @Test
    void demoScenarioWritesTheSameBytesTwice(@TempDir Path first, @TempDir Path second) throws IOException {
        DemoScenarioGenerator.generate(first, SMALL);
        DemoScenarioGenerator.generate(second, SMALL);
        for (String file : DemoScenarioGenerator.FILES) {
            assertArrayEquals(Files.readAllBytes(first.resolve(file)), Files.readAllBytes(second.resolve(file)), file);
        }
    }

    @Test
    void anotherSeedGivesAnotherPanel(@TempDir Path first, @TempDir Path second) throws IOException {
        DemoScenarioGenerator.generate(first, SMALL);
        DemoScenarioGenerator.generate(second, new DemoScenarioGenerator.Config(40, YearMonth.of(2010, 1), 48, 100L));
        String panel = DemoScenarioGenerator.PANEL_FILE;
        assertNotEquals(SeedDataFolder.contentSha256(first.resolve(panel)), SeedDataFolder.contentSha256(second.resolve(panel)));
    }

    @Test
    void syntheticPanelWritesTheSameTextTwiceAndGzipHoldsTheSameText(@TempDir Path dir) throws IOException {
        StringWriter once = new StringWriter();
        StringWriter twice = new StringWriter();
        SyntheticPanelWriter.write(once, 25, 300, 11L);
        SyntheticPanelWriter.write(twice, 25, 300, 11L);
        assertEquals(once.toString(), twice.toString());

        Path gz = dir.resolve("panel.csv.gz");
        SyntheticPanelWriter.write(gz, 25, 300, 11L);
        try (InputStream in = SeedDataFolder.openContent(gz)) {
            assertEquals(once.toString(), new String(in.readAllBytes(), StandardCharsets.UTF_8));
        }
    }

    @Test
    void syntheticPanelHasOneRowPerSecurityAndDateAfterTheHeader() throws IOException {
        StringWriter out = new StringWriter();
        SyntheticPanelWriter.write(out, 7, 30, 3L);
        String[] lines = out.toString().split("\n");
        assertEquals(PanelLayout.HEADER, lines[0]);
        assertEquals(1 + 7 * 30, lines.length);
        int columns = PanelLayout.HEADER.split(",", -1).length;
        for (int i = 1; i < lines.length; i++) {
            String[] cells = lines[i].split(",", -1);
            assertEquals(columns, cells.length, lines[i]);
            for (int c = 2; c < columns - 2; c++) {
                assertFalse(cells[c].contains("E") || cells[c].contains("e"), "plain notation only: " + lines[i]);
            }
        }
        assertTrue(lines[1].startsWith("2000-01-03,SY00001,"), lines[1]);
    }
}
