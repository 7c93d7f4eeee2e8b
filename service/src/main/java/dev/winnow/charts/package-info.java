/** SVG drawing of time series and heatmaps: pure functions of numbers to text. Imports nothing of the project. */
package dev.winnow.charts;
