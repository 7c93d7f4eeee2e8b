/**
 * HTTP only: routes, request parsing ({@code Requests}, {@code SeriesRequest}), response mapping, authentication and
 * the one mapping of failures to RFC 9457 problems ({@code ApiServer.mapErrors}). Handlers call use cases in
 * {@code research} or the stores and write what they return. May import {@code jobs}, {@code research},
 * {@code ingest}, {@code store}, {@code construct}, {@code stats}, {@code charts} and Javalin; nothing imports it but
 * {@code app}.
 */
package dev.winnow.api;
