package dev.winnow.research;

/**
 * A request names something that does not exist (a factor, version, panel, theme, security or loadings config). The
 * message says what was not found and where to look.
 */
public final class UnknownNameException extends RuntimeException {
    private final NameKind listed;

    public UnknownNameException(String message) {
        this(message, null);
    }

    /** {@code listed}: the kind of the unknown name, so that the answer can say where such names are listed. */
    public UnknownNameException(String message, NameKind listed) {
        super(message);
        this.listed = listed;
    }

    /** The kind of the unknown name, or null. */
    public NameKind listed() {
        return listed;
    }
}
