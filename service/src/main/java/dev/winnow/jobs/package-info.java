/**
 * The job queue, its single worker, the list of job kinds and the jobs themselves (uploads, builds, loadings
 * history). May import {@code research}, {@code ingest}, {@code store}, {@code construct} and {@code stats}; never
 * HTTP.
 */
package dev.winnow.jobs;
