package dev.winnow.research;

/** A request is well formed but conflicts with the current state (for example an upload to a built factor). */
public final class ConflictException extends RuntimeException {
    public ConflictException(String message) {
        super(message);
    }
}
