/**
 * Definitions to weights to returns: factor definitions and their validation, the construction engine and its rules,
 * calendars, drifting holdings, turnover, resumable state, signal recipes and security loadings. Reads panels only
 * through {@code PanelSource}. May import {@code stats}; never {@code store}, nor HTTP.
 */
package dev.winnow.construct;
