// Acquisition settings of a campaign. Versioned: every change makes a new version, and hits
// record the version they were taken under. Units are in the field names.
import { z } from 'zod';
import { fileNamePatternProblem } from './bridge.ts';

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive(`${what} must be > 0`);

export const exponentialWindowSchema = z.discriminatedUnion('mode', [
  z.strictObject({ mode: z.literal('none') }),
  z.strictObject({ mode: z.literal('tau'), tauS: positive('the time constant τ (s)').max(1000) }),
  z.strictObject({
    mode: z.literal('end-level'),
    /** Value of the window at the end of the record, in % (common practice: 1 %, Fladung 1997). */
    endLevelPercent: positive('the end level (%)').max(100),
  }),
]);

export const acquisitionSettingsSchema = z
  .strictObject({
    sampleRateHz: positive('the sample rate (Hz)').max(1_000_000),
    recordLengthS: positive('the record length (s)').max(120),
    preTriggerS: z.number().finite().min(0, 'the pre-trigger cannot be negative'),
    triggerLevelN: positive('the trigger level (N)').max(1e6),
    forceWindow: z.strictObject({
      /** Length of the unity part from the record start (pre-trigger included), s. */
      lengthS: positive('the force window length (s)'),
      /** Half-cosine taper after the unity part, s. */
      taperS: z.number().finite().min(0),
    }),
    exponentialWindow: exponentialWindowSchema,
    hitsToAverage: z.number().int().min(1).max(100),
    bandHz: z.strictObject({ low: z.number().finite().min(0), high: positive('the upper band edge (Hz)') }),
    estimator: z.enum(['H1', 'H2']),
    /** Second impact above this fraction of the first peak → double hit (common practice). */
    doubleHitRatio: z.number().finite().gt(0).lt(1),
    /** Samples at or above this % of the input range → overload (common practice: 99 %). */
    overloadPercent: z.number().finite().min(50).max(100),
    /** Largest allowed drop of the force spectrum across the band, dB (common practice: 10–20 dB). */
    rollOffDb: z.number().finite().min(1).max(60),
    /** Mean coherence over the band needed for a DOF to count as done (common practice). */
    coherenceThreshold: z.number().finite().min(0).max(1),
    /** Weakest acceptable peak force, N (below it the hit is too soft: poor signal-to-noise). Common practice. */
    minPeakN: z.number().finite().min(0).default(20),
    forceRangeN: positive('the force input range (N)'),
    responseRangeMs2: positive('the response input range (m/s²)'),
    /** Uploads at another sample rate are resampled to sampleRateHz (polyphase, anti-aliased) instead of refused. */
    resampleUploads: z.boolean().default(false),
    /** File names the watched-folder bridge reads the DOF from, e.g. `{response}_{excitation}_*.wav`; empty: the armed DOF. */
    bridgeFilePattern: z.string().trim().max(200).default('').refine((p) => p === '' || fileNamePatternProblem(p) === null, { message: 'the file name pattern needs {response} or {excitation} (or both), each at most once' }),
  })
  .superRefine((s, ctx) => {
    const nyquist = s.sampleRateHz / 2;
    if (s.preTriggerS >= s.recordLengthS) ctx.addIssue({ code: 'custom', path: ['preTriggerS'], message: 'the pre-trigger must be shorter than the record' });
    if (s.forceWindow.lengthS + s.forceWindow.taperS > s.recordLengthS) ctx.addIssue({ code: 'custom', path: ['forceWindow'], message: 'the force window (length + taper) must fit in the record' });
    if (s.forceWindow.lengthS <= s.preTriggerS) ctx.addIssue({ code: 'custom', path: ['forceWindow', 'lengthS'], message: 'the force window must reach past the pre-trigger to hold the pulse' });
    if (s.bandHz.high > nyquist) ctx.addIssue({ code: 'custom', path: ['bandHz', 'high'], message: `the band must end at or below half the sample rate (${nyquist} Hz)` });
    if (s.bandHz.low >= s.bandHz.high) ctx.addIssue({ code: 'custom', path: ['bandHz', 'low'], message: 'the band must start below its upper edge' });
    if (s.recordLengthS * s.sampleRateHz > 2_097_152) ctx.addIssue({ code: 'custom', path: ['recordLengthS'], message: 'a record can hold at most 2 097 152 samples per channel' });
  });

export type AcquisitionSettings = z.output<typeof acquisitionSettingsSchema>;

/**
 * Defaults a lead starts from: 12.8 kHz, 1.28 s records (16 384 samples, Δf = 0.78 Hz), 5 hits,
 * H1 (docs/methods.md#h1-h2-coherence: the usual choice for impact tests), exponential window to 1 % at the
 * end of the record (Fladung 1997), checks as in docs/methods.md#hit-checks (common practice).
 */
export const defaultAcquisitionSettings: AcquisitionSettings = {
  sampleRateHz: 12_800,
  recordLengthS: 1.28,
  preTriggerS: 0.01,
  triggerLevelN: 5,
  forceWindow: { lengthS: 0.02, taperS: 0.002 },
  exponentialWindow: { mode: 'end-level', endLevelPercent: 1 },
  hitsToAverage: 5,
  bandHz: { low: 0, high: 2000 },
  estimator: 'H1',
  doubleHitRatio: 0.04,
  overloadPercent: 99,
  rollOffDb: 20,
  coherenceThreshold: 0.9,
  minPeakN: 20,
  forceRangeN: 2000,
  responseRangeMs2: 500,
  resampleUploads: false,
  bridgeFilePattern: '',
};

export const settingsUpdateSchema = z.strictObject({
  /** The version the change is based on; a newer version on the server answers 409. */
  baseVersion: z.number().int().min(0),
  settings: acquisitionSettingsSchema,
  reason: z.string().trim().max(500).default(''),
});
