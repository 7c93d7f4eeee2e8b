package dev.winnow.research;

/** A request asks for something that cannot be done as asked; the message says what to send instead. */
public final class InvalidRequestException extends RuntimeException {
    private final NameKind listed;

    public InvalidRequestException(String message) {
        this(message, null);
    }

    /** {@code listed}: the kind of a name the request gave that names nothing (see {@link NameKind}), or null. */
    public InvalidRequestException(String message, NameKind listed) {
        super(message);
        this.listed = listed;
    }

    /** The kind of the unknown name, or null. */
    public NameKind listed() {
        return listed;
    }
}
