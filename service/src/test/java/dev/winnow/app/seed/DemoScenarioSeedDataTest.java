package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The committed seed-data files are exactly what the committed generator writes: regenerating the demo scenario gives
 * the same content (compared as SHA-256 of the uncompressed bytes, so the gzip implementation does not matter).
 */
class DemoScenarioSeedDataTest {

    @Test
    void committedSeedDataMatchesTheGenerator(@TempDir Path regenerated) throws IOException {
        Path committed = SeedDataFolder.locate();
        DemoScenarioGenerator.generate(regenerated, DemoScenarioGenerator.Config.DEMO);
        for (String file : DemoScenarioGenerator.FILES) {
            assertEquals(SeedDataFolder.contentSha256(committed.resolve(file)),
                    SeedDataFolder.contentSha256(regenerated.resolve(file)),
                    "seed-data/" + file + " differs from the generator's output; regenerate it with "
                            + "DemoScenarioGenerator seed-data");
        }
    }
}
