/**
 * Version of the averaging path that turns accepted hits into spectra: offset removal, the force
 * and exponential windows, the transient-spectrum scaling and the H1/H2/coherence engine.
 * Stored results are keyed by a hash that includes this number, so a change to any of those
 * steps must increase it: results computed by the old code are then recomputed, never served.
 */
export const FRF_ALGORITHM_VERSION = 1;
