package dev.winnow.ingest;

/** A {@link CrossSectionSink} or {@link SecurityIds} implementation failed; the cause is its exception. */
public final class SinkException extends Exception {

    public SinkException(Throwable cause) {
        super("the store failed while receiving the upload: " + cause.getMessage(), cause);
    }
}
