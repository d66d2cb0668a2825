/**
 * Kernels shared by the spatial packages: great-circle distances from chords, overflow-free
 * norms and scale factors, neighbour candidates ordered by distance, the bounded nearest-neighbour
 * heap of grid kriging. Internal: not exported outside the Densa modules; may change without
 * notice.
 */
package io.densa.spatial.internal;
