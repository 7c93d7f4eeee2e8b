package dev.winnow.store;

import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.sql.SQLException;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Which failures count as storage faults (503/507 and a "disk full" job error) and which do not. */
class StorageFaultsTest {

    @Test
    void aFullDiskAnywhereInTheCausesIsADiskFullStorageFault() {
        RuntimeException wrapped = new RuntimeException("could not stage", new IllegalStateException("MVStore",
                new IOException("No space left on device")));
        assertTrue(StorageFaults.isDiskFull(wrapped));
        assertTrue(StorageFaults.isStorageFault(wrapped));
        assertTrue(StorageFaults.isDiskFull(new SQLException("could not extend file", "53100")));
    }

    @Test
    void aClosedH2DatabaseOrALostConnectionIsAStorageFaultButNotAFullDisk() {
        SQLException closed = new SQLException("The database has been closed", "90098", 90098);
        assertTrue(StorageFaults.isStorageFault(new RuntimeException(closed)));
        assertFalse(StorageFaults.isDiskFull(closed));
        assertTrue(StorageFaults.isStorageFault(new SQLException("connection refused", "08001")));
    }

    @Test
    void dataAndCodeFailuresAreNotStorageFaults() {
        assertFalse(StorageFaults.isStorageFault(new IllegalArgumentException("bad definition")));
        assertFalse(StorageFaults.isStorageFault(new SQLException("duplicate key", "23505")));
        assertFalse(StorageFaults.isStorageFault(new java.util.zip.ZipException("not in GZIP format")));
        assertFalse(StorageFaults.isStorageFault(new RuntimeException(new com.fasterxml.jackson.core.JsonParseException(null, "bad json"))));
        assertFalse(StorageFaults.isStorageFault(new NullPointerException()));
    }
}
