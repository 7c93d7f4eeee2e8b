package dev.winnow.research;

/**
 * A request names something that does not exist (a factor, version, panel, theme, security or loadings config). The
 * message says what was not found and where to look.
 */
public final class UnknownNameException extends RuntimeException {
    public UnknownNameException(String message) {
        super(message);
    }
}
