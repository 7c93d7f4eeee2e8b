package dev.winnow.research;

/**
 * A study (Fama-MacBeth, information coefficients, model tests, portfolios) asked for something the data does not
 * have: an unknown panel, column, factor or portfolio, or a parameter that does not fit them. The message says what
 * to send instead; the API answers it as a 400.
 */
public final class InvalidStudyException extends RuntimeException {
    public InvalidStudyException(String message) {
        super(message);
    }
}
