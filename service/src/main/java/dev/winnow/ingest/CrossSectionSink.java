package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import dev.winnow.store.SliceDecimals;

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
     * Receives a cross-section with the decimal forms the parser read its numbers in (null when it kept none), which
     * a sink that encodes slices may pass on to the encoder; by default only the cross-section.
     */
    default void accept(CrossSection crossSection, SliceDecimals decimals) throws Exception {
        accept(crossSection);
    }

    /**
     * Forgets every cross-section accepted so far: the parser is starting over with another strategy for the same
     * file (see {@link PanelUploadParser#parse}). A sink that cannot forget may throw, which fails the parse.
     */
    default void discardAccepted() throws Exception {
        throw new UnsupportedOperationException("this sink cannot discard what it received");
    }
}
