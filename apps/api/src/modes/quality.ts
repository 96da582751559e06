// Fit quality in words, with the number that tripped each warning. The limits are Resonote's defaults
// (common practice, not a standard): MPC below 0.9 suggests a complex shape (close modes, noise or
// non-proportional damping; Pappa, Elliott & Schenk 1993), a synthesis error above 10 % of the
// measured FRF's energy in the band says the chosen modes do not explain that FRF, and a CMIF peak
// without a stable column is a mode the diagram did not find.

export const QUALITY_LIMITS = { mpc: 0.9, synthesisErrorPercent: 10 } as const;

export interface QualityWarning {
  code: 'cmif-peak-without-column' | 'synthesis-error' | 'low-mpc';
  message: string;
  fHz?: number;
  value?: number;
}

const hz = (f: number) => (f >= 100 ? f.toFixed(1) : f.toFixed(2));

export function cmifWarnings(peaksHz: readonly number[]): QualityWarning[] {
  return peaksHz.map((f) => ({
    code: 'cmif-peak-without-column' as const,
    fHz: f,
    message: `The CMIF peaks at ${hz(f)} Hz but no stable column stands there: a mode may be missing. Fit a narrower band around it or a higher order.`,
  }));
}

export function synthesisWarnings(errors: readonly { response: string; reference: string; errorPercent: number }[], limit: number = QUALITY_LIMITS.synthesisErrorPercent): QualityWarning[] {
  return errors
    .filter((e) => Number.isFinite(e.errorPercent) && e.errorPercent > limit)
    .map((e) => ({
      code: 'synthesis-error' as const,
      value: e.errorPercent,
      message: `FRF ${e.response} / ${e.reference}: synthesis error ${e.errorPercent.toFixed(1)} % is above ${limit} % (common practice): the chosen modes do not explain this FRF well; look for a missing mode or a bad measurement.`,
    }));
}

export function mpcWarnings(modes: readonly { fHz: number; mpc: number }[], limit: number = QUALITY_LIMITS.mpc): QualityWarning[] {
  return modes
    .filter((m) => m.mpc < limit)
    .map((m) => ({
      code: 'low-mpc' as const,
      fHz: m.fHz,
      value: m.mpc,
      message: `The mode at ${hz(m.fHz)} Hz has MPC ${m.mpc.toFixed(2)}, below ${limit} (common practice): its shape is complex — check for a close mode, noise or a poor pole choice.`,
    }));
}
