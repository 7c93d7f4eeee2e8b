/**
 * Configuration, wiring and the command line: {@code Winnow} builds every store, use case, job and route collaborator
 * once; {@code Main} runs {@code serve}, {@code demo} and {@code bench}. May import every package.
 */
package dev.winnow.app;
