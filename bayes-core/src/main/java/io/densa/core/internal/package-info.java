/**
 * Internal kernels shared by the Densa modules (dense row-major products, blocked sums). Not
 * public API: these classes may change without notice. Every kernel is deterministic: parallel and
 * serial runs give bit-identical results.
 */
package io.densa.core.internal;
