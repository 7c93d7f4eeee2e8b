package dev.winnow.research;

/** A request asks for something that cannot be done as asked; the message says what to send instead. */
public final class InvalidRequestException extends RuntimeException {
    public InvalidRequestException(String message) {
        super(message);
    }
}
