/**
 * Pure math, no I/O: every public estimator states its formula and published source and checks its arguments.
 * Imports nothing of the project.
 */
package dev.winnow.stats;
