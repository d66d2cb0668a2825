package io.densa.io.tables;


/**
 * What a {@link BulkObservations} pass delivered.
 *
 * @param units        units (unit–period pairs) delivered
 * @param batches      batches handed to the consumer
 * @param observations observations kept (clamped ones included)
 * @param outside      the account of values outside the range
 * @param source       the file that was read
 */
public record BulkSummary(long units, int batches, long observations, OutsideReport outside, String source) {
}
