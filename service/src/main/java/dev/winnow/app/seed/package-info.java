/**
 * Generators of the invented demo scenario and of benchmark data. May import {@code app}; nothing else of the project.
 */
package dev.winnow.app.seed;
