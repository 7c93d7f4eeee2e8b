package dev.winnow.research;

/**
 * The kind of thing a request named that does not exist. Domain messages say what was not found; the API adds where
 * names of that kind are listed, so that no HTTP path is spelt below it.
 */
public enum NameKind {
    FACTOR,
    PANEL,
    FAMILY,
    THEME
}
