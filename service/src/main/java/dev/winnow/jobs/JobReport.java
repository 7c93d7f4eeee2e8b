package dev.winnow.jobs;

/** A finished job's report: one of the records of {@link JobReports}, kept in the store as JSON. */
public interface JobReport {
}
