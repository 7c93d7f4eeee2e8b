package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;

/**
 * Receives a panel upload's cross-sections, one per date in ascending date order, during the parser's second pass.
 * The parser may already have handed over cross-sections when it finds duplicate (date, security) rows, which make
 * the whole upload fail: the implementation must stage what it receives and publish only when the parse result has
 * no errors.
 */
@FunctionalInterface
public interface CrossSectionSink {

    void accept(CrossSection crossSection) throws Exception;
}
