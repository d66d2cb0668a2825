/**
 * Saved models: fitted objects a backend needs, written to and read from Densa's versioned JSON
 * model format (specified in {@code docs/model-format.md}) through {@link io.densa.io.model.ModelFile}.
 *
 * <p>A baseline fitted once and scored in another process:
 * <pre>{@code
 * FunctionOnFunctionFit fit = FunctionalRegression.truncation().fit(List.of(past), null, now);
 * AnomalyScoring.Calibrated calibrated = AnomalyScoring.withDefaults().fit(heldOutResiduals, grid);
 * ModelFile.save(Path.of("baseline.densa.json"),
 *         ModelBundle.of(Map.of("fit", fit, "calibration", calibrated)));
 *
 * // later, in the backend (limits guard against hostile files)
 * ModelBundle b = ModelFile.load(Path.of("baseline.densa.json"), ModelBundle.class, ModelLimits.defaults());
 * AnomalyScoring.Report report = b.get("calibration", AnomalyScoring.Calibrated.class)
 *         .score(b.get("fit", FunctionOnFunctionFit.class).residuals(List.of(previous), null, current));
 * }</pre>
 * One model per file works the same way: {@code ModelFile.save(path, kriging)} and
 * {@code ModelFile.load(path, Kriging.class)}.
 *
 * <p>Semantics: a loaded model's predictions and scores equal the saved model's bit for bit.
 * A function-on-scalar fit is stored with its inputs (design, response, weights, penalty) and
 * refitted on load, a closed-form solve that reproduces it exactly; every other type is rebuilt
 * from its stored state without fitting. A file that is truncated, malformed, altered, of a newer
 * format version or over a {@link io.densa.io.model.ModelLimits} limit is refused with an
 * {@link java.lang.IllegalArgumentException} naming the file and field; nothing is half-loaded.
 */
package io.densa.io.model;
