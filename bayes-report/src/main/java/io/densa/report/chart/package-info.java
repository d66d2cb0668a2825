/**
 * Charts of a report (JFreeChart): x–y charts with quantity and unit on their axes
 * ({@link io.densa.report.chart.Chart}, {@link io.densa.report.chart.ChartGrid}, {@link io.densa.report.chart.Axis})
 * and the ready-made figures of densities, estimates, FPCA modes and variograms
 * ({@link io.densa.report.chart.Figures}, data shown through {@link io.densa.report.chart.Observed}).
 */
package io.densa.report.chart;
