/**
 * Jdbi and portable SQL (H2 and PostgreSQL), one store per aggregate, and the codecs of stored payloads. May import
 * {@code construct} and {@code stats}; never HTTP.
 */
package dev.winnow.store;
