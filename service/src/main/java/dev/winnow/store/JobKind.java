package dev.winnow.store;

/**
 * The one list of job kinds. The wire name (lower case, as {@code panel_upload}) is what the store keeps and what
 * {@code GET /v1/jobs/{id}} answers as {@code kind}; each kind has one parameter record in {@code jobs.JobParams}.
 */
public enum JobKind {
    /** A panel's CSV upload, then the extension or rebuild of the factors built on it. */
    PANEL_UPLOAD,
    /** An external factor's series upload, then the rebuild of the factors that read it. */
    SERIES_UPLOAD,
    /** The build of one factor version, then the rebuild of the factors that read it. */
    FACTOR_BUILD,
    /** The build of a variant family's new versions in one pass over each panel. */
    FAMILY_BUILD,
    /** The loadings of every date of a panel under its config. */
    LOADINGS_HISTORY,
    /** Giving back the space the embedded store no longer uses. */
    COMPACT_STORE;

    public String wireName() {
        return WireNames.of(this);
    }

    /** The wire name, so that logs and messages spell the kind as the API does. */
    @Override
    public String toString() {
        return wireName();
    }

    /** The kind of a stored wire name; IllegalStateException for one this build does not know. */
    public static JobKind fromWire(String wire) {
        return WireNames.parse(JobKind.class, wire, "job kind in the store");
    }
}
