/**
 * The streaming CSV parsers of uploads and the upload spool. May import {@code store}, {@code construct} and
 * {@code stats}; never HTTP.
 */
package dev.winnow.ingest;
