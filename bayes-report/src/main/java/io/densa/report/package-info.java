/**
 * Reports of Densa results that any study can write: a {@link io.densa.report.Report} assembles
 * headings, text, {@link io.densa.report.Table tables}, {@link io.densa.report.Figure figures} and
 * maps, and writes summary.md, a self-contained summary.html, CSV tables, GeoJSON units (through
 * bayes-io) and PNG figures into a folder that holds only the current report's files. This package
 * holds the document (report, tables, findings, number formats); the figures sit in
 * {@code io.densa.report.chart} (x–y charts and ready-made figures), {@code io.densa.report.map}
 * (maps in Java2D) and {@code io.densa.report.colour} (ramps, palettes, colour scales).
 *
 * <h2>Building blocks</h2>
 * <ul>
 *   <li>{@link io.densa.report.chart.Figures}: a unit's density with its data, estimate against baseline,
 *       FPCA modes of variation, fitted over empirical trace-variograms with pairs per bin;</li>
 *   <li>{@link io.densa.report.chart.Chart} and {@link io.densa.report.chart.ChartGrid}: x–y charts (JFreeChart)
 *       whose {@link io.densa.report.chart.Axis axes} carry quantity and unit, log axes labelled in the
 *       original unit, dashed lines dashed end to end;</li>
 *   <li>{@link io.densa.report.map.Maps}: choropleths of any unit value, category maps with counts,
 *       local-cluster maps (pattern and outline on one ramp of the local statistic), grid maps,
 *       interval maps and point maps, each with legend, scale bar and north arrow (Java2D);</li>
 *   <li>{@link io.densa.report.Findings}: sentences generated from the tests that decide them, and
 *       the warnings of fits and estimates in words;</li>
 *   <li>{@link io.densa.report.colour.ColourRamp}, {@link io.densa.report.colour.Palette},
 *       {@link io.densa.report.colour.ColourScale}: Densa's own colours, computed in OKLab, with monotone
 *       lightness, checked under simulated colour-vision deficiencies
 *       ({@link io.densa.report.colour.ColourVision}).</li>
 * </ul>
 *
 * <h2>Semantics</h2>
 * Maps take planar coordinates in a stated length unit ({@link io.densa.report.map.MapFrame}); GeoJSON
 * takes WGS 84 longitude/latitude. Figures are rendered headless. Reports carry a caution that their
 * outputs are statistical signals for trained analysts, not diagnoses or regulatory assessments.
 * This module writes files; the library modules (core, regression, spatial) never do.
 */
package io.densa.report;
