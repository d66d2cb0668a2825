/**
 * Maps of a report, drawn in Java2D: choropleths, category, local-cluster, grid,
 * interval and point maps with legend, scale bar and north arrow ({@link io.densa.report.map.Maps},
 * {@link io.densa.report.map.MapFigure}) over planar coordinates in a stated unit
 * ({@link io.densa.report.map.MapFrame}, grids in {@link io.densa.report.map.GridValues}).
 */
package io.densa.report.map;
