package dev.winnow.jobs;

import dev.winnow.store.Database;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JobStore.JobRecord;

/** Job kind {@code compact_store}: gives back the space the H2 store no longer uses (see {@link Database#compact()}). */
public final class StoreCompactionJob implements JobHandler {
    private final Database database;

    public StoreCompactionJob(Database database) {
        this.database = database;
    }

    @Override
    public JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception {
        Database.Compaction done = database.compact();
        return JobOutcome.success(new Counters(1, 0, 0, 0),
                new JobReports.StoreCompaction(done.bytesBefore(), done.bytesAfter(), done.note()));
    }
}
