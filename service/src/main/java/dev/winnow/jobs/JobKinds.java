package dev.winnow.jobs;

/** The kinds of job the worker runs. */
public final class JobKinds {
    public static final String PANEL_UPLOAD = "panel_upload";
    public static final String SERIES_UPLOAD = "series_upload";
    public static final String FACTOR_BUILD = "factor_build";
    public static final String FAMILY_BUILD = "family_build";
    public static final String COMPACT_STORE = "compact_store";

    private JobKinds() {
    }
}
