/**
 * The domain use cases shared by the API and the jobs: the trial library and factor evidence, breadth rebuilds,
 * themes and composites, loadings, cost lookups, signal previews, declaring and building factors. Returns values and
 * throws {@code UnknownNameException}, {@code InvalidRequestException} or {@code ConflictException}; starts work through
 * the {@code WorkQueue} port. May import {@code store}, {@code construct} and {@code stats}; never {@code jobs},
 * {@code api} or HTTP.
 */
package dev.winnow.research;
