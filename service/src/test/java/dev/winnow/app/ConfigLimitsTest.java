package dev.winnow.app;

import dev.winnow.store.Limits;
import org.junit.jupiter.api.Test;

import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Issue 14: durability does not depend on how WINNOW_DB_URL is spelled, and the byte limits read from the environment. */
class ConfigLimitsTest {

    @Test
    void everyH2FileUrlGetsWriteDelayZero() {
        assertEquals("jdbc:h2:file:/srv/w/store;WRITE_DELAY=0", url("jdbc:h2:file:/srv/w/store"));
        assertEquals("jdbc:h2:/srv/w/store;FILE_LOCK=FS;WRITE_DELAY=0", url("jdbc:h2:/srv/w/store;FILE_LOCK=FS"));
        assertEquals("jdbc:h2:file:/srv/w/store;write_delay=0", url("jdbc:h2:file:/srv/w/store;write_delay=0"));
        assertEquals("jdbc:postgresql://db/w", url("jdbc:postgresql://db/w"));
        assertTrue(Config.fromEnvironment(Map.of("WINNOW_DATA_DIR", "/tmp/w")).dbUrl().contains(";WRITE_DELAY=0"));
    }

    @Test
    void settingsThatLoseCommitsAreRefusedWithAMessageSayingWhatToChange() {
        IllegalArgumentException delay = assertThrows(IllegalArgumentException.class, () -> url("jdbc:h2:file:/srv/w;WRITE_DELAY=500"));
        assertTrue(delay.getMessage().contains("WRITE_DELAY=500"), delay.getMessage());
        assertThrows(IllegalArgumentException.class, () -> url("jdbc:h2:mem:w"));
        assertThrows(IllegalArgumentException.class, () -> url("jdbc:h2:file:/srv/w;LOG=0"));
    }

    @Test
    void byteLimitsComeFromTheEnvironmentWithDefaults() {
        Config defaults = Config.fromEnvironment(Map.of());
        assertEquals(16L << 30, defaults.limits().maxUploadBytes());
        assertEquals(1L << 30, defaults.limits().minFreeBytes());
        Config set = Config.fromEnvironment(Map.of("WINNOW_MAX_UPLOAD_BYTES", "2G", "WINNOW_MIN_FREE_BYTES", "500000"));
        assertEquals(2L << 30, set.limits().maxUploadBytes());
        assertEquals(500_000, set.limits().minFreeBytes());
        assertEquals(3L << 20, Limits.parseBytes("X", "3MiB"));
        IllegalArgumentException bad = assertThrows(IllegalArgumentException.class,
                () -> Config.fromEnvironment(Map.of("WINNOW_MAX_UPLOAD_BYTES", "lots")));
        assertTrue(bad.getMessage().contains("WINNOW_MAX_UPLOAD_BYTES"), bad.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Config.fromEnvironment(Map.of("WINNOW_MAX_UPLOAD_BYTES", "0")));
    }

    private static String url(String given) {
        return Config.fromEnvironment(Map.of("WINNOW_DB_URL", given)).dbUrl();
    }
}
