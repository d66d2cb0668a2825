/**
 * Densa's colours, computed in OKLab ({@link io.densa.report.colour.Oklab}): ramps with
 * monotone lightness ({@link io.densa.report.colour.ColourRamp}), categorical colours
 * ({@link io.densa.report.colour.Palette}), value-to-colour scales with ticks
 * ({@link io.densa.report.colour.ColourScale}) and simulated colour-vision deficiencies for checking
 * them ({@link io.densa.report.colour.ColourVision}).
 */
package io.densa.report.colour;
