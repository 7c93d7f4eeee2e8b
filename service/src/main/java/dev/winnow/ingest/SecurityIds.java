package dev.winnow.ingest;

/**
 * Maps security identifiers to panel-local integer ids. Distinct codes must get distinct ids (any ints); the same
 * code must always get the same id. The parser caches the answers and asks once per distinct code and parse.
 */
@FunctionalInterface
public interface SecurityIds {

    int idFor(String code) throws Exception;
}
