package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;

/**
 * Receives a panel upload's cross-sections, one per date in ascending date order.
 * The parser may already have handed over cross-sections when it finds duplicate (date, security) rows, which make
 * the whole upload fail: the implementation must stage what it receives and publish only when the parse result has
 * no errors.
 */
@FunctionalInterface
public interface CrossSectionSink {

    void accept(CrossSection crossSection) throws Exception;

    /**
     * Forgets every cross-section accepted so far: the parser is starting over with another strategy for the same
     * file (see {@link PanelUploadParser#parse}). A sink that cannot forget may throw, which fails the parse.
     */
    default void discardAccepted() throws Exception {
        throw new UnsupportedOperationException("this sink cannot discard what it received");
    }
}
