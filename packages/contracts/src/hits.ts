// The answers of the hit and result routes, as JSON on the wire: the API declares them on its
// routes (OpenAPI response bodies) and the web reads its types from here. Dates are ISO strings.
import { z } from 'zod';
import { scheduleStatuses } from './schedule.ts';
import type { FlagReason } from './flag-reasons.ts';

/** How an FRF is expressed: displacement, velocity or acceleration per force (docs/methods.md#frf-kinds). */
export const frfKinds = ['receptance', 'mobility', 'accelerance'] as const;
export const frfKindSchema = z.enum(frfKinds);
export type FrfKind = (typeof frfKinds)[number];
export const frfUnits: Record<FrfKind, string> = { receptance: 'm/N', mobility: '(m/s)/N', accelerance: '(m/s²)/N' };

export const verdictSchema = z.enum(['accept', 'reject']);
export type Verdict = z.infer<typeof verdictSchema>;

export const hitReasonSchema = z.object({ code: z.string(), message: z.string() });
export type HitReason = z.infer<typeof hitReasonSchema>;

export const hitMetricsSchema = z.object({
  peakForceN: z.number(),
  pulseWidthS: z.number().nullable(),
  impulseNs: z.number(),
  rollOff10dBHz: z.number().nullable(),
  rollOff20dBHz: z.number().nullable(),
  secondPeakRatio: z.number().nullable(),
  secondPeakDelayS: z.number().nullable(),
  forceClippedSamples: z.number(),
  noiseRmsN: z.number(),
  peakTimeS: z.number().nullable(),
  responsePeaks: z.array(z.number()),
  responseTailRatios: z.array(z.number()),
});
export type HitMetrics = z.infer<typeof hitMetricsSchema>;

/** Why an entry is flagged, in words with numbers (flag-reasons.ts computes them). */
export const flagReasonSchema: z.ZodType<FlagReason> = z.object({
  code: z.enum(['low-coherence', 'hits-left-out', 'no-average']),
  message: z.string(),
  value: z.number(),
  threshold: z.number(),
  advice: z.string(),
});

export const hitSummarySchema = z.object({
  id: z.string(),
  sequence: z.number().int(),
  verdict: verdictSchema,
  autoVerdict: verdictSchema,
  overridden: z.boolean(),
  reasons: z.array(hitReasonSchema),
  metrics: hitMetricsSchema,
  overrideNote: z.string().nullable(),
  source: z.string(),
  settingsVersion: z.number().int(),
  recordedBy: z.string().nullable(),
  recordedAt: z.string(),
  version: z.number().int(),
  /** Set aside by a redo of the DOF (kept, not counted): who, why, when. Only in GET …/hits. */
  setAside: z.object({ redoId: z.string(), by: z.string().nullable(), reason: z.string(), at: z.string() }).nullable().optional(),
});
export type HitSummary = z.infer<typeof hitSummarySchema>;

export const complexJsonSchema = z.object({ re: z.array(z.number()), im: z.array(z.number()) });
export type ComplexJson = z.infer<typeof complexJsonSchema>;

const entryAboutSchema = z.object({ id: z.string(), responseDof: z.string(), excitationDof: z.string(), drivingPoint: z.boolean() });

/** The averaged FRF of one entry: every response channel, or only the main one in a hit answer (`channelCount` says how many there are). */
export const frfJsonSchema = z.object({
  kind: frfKindSchema,
  unit: z.string(),
  estimators: z.string(),
  averages: z.number().int(),
  settingsVersion: z.number().int(),
  inputHash: z.string(),
  hitIds: z.array(z.string()),
  excluded: z.array(z.object({ hitId: z.string(), reason: z.string() })),
  computedAt: z.string(),
  sampleRateHz: z.number(),
  samples: z.number().int(),
  df: z.number(),
  f: z.array(z.number()),
  excitationDof: z.string(),
  forceEsd: z.object({ unit: z.string(), scaling: z.string(), values: z.array(z.number()) }),
  channelCount: z.number().int(),
  channels: z.array(
    z.object({ channelIndex: z.number().int(), responseDof: z.string(), meanCoherence: z.number().nullable(), h1: complexJsonSchema, h2: complexJsonSchema, coherence: z.array(z.number()) }),
  ),
  resampledFromHz: z.number().nullable().optional(),
});
export type FrfJson = z.infer<typeof frfJsonSchema>;

/** GET …/schedule/:entryId/frf: the FRF, or an ordinary "no accepted hit yet". */
export const entryFrfAnswerSchema = z.discriminatedUnion('status', [
  frfJsonSchema.extend({
    status: z.literal('ready'),
    entry: entryAboutSchema,
    /** Whether accepted hits went through resamplePoly, from which rate, how many (hits/resample-upload.ts). */
    resampled: z.boolean(),
    resampledFromHz: z.number().nullable(),
    resampledHits: z.number().int(),
  }),
  z.object({ status: z.literal('no-accepted-hit'), entry: entryAboutSchema, message: z.string() }),
]);
export type EntryFrfAnswer = z.infer<typeof entryFrfAnswerSchema>;
export type ReadyFrf = Extract<EntryFrfAnswer, { status: 'ready' }>;

/** The answer after a hit upload, a simulated strike or a verdict. */
export const hitsAnswerSchema = z.object({
  replayed: z.boolean(),
  hits: z.array(hitSummarySchema),
  skipped: z.array(z.object({ timeS: z.number(), reason: z.string() })),
  entry: z.object({ id: z.string(), status: z.enum(scheduleStatuses), acceptedHits: z.number().int(), totalHits: z.number().int(), flagReasons: z.array(flagReasonSchema) }),
  /** The main channel of the entry's FRF (the channel that measures its response DOF). */
  frf: frfJsonSchema.nullable(),
  next: z.string().nullable(),
  resampled: z.object({ fromHz: z.number(), toHz: z.number(), up: z.number().int(), down: z.number().int(), method: z.string(), originalRecordingId: z.string().nullable() }).optional(),
});
export type HitsAnswer = z.infer<typeof hitsAnswerSchema>;

export const entryHitsAnswerSchema = z.object({
  entry: z.object({ id: z.string(), responseDof: z.string(), excitationDof: z.string(), status: z.enum(scheduleStatuses), requiredHits: z.number().int(), version: z.number().int(), flagReasons: z.array(flagReasonSchema) }),
  hits: z.array(hitSummarySchema),
});
export type EntryHits = z.infer<typeof entryHitsAnswerSchema>;

export const hitDetailSchema = z.object({
  hit: hitSummarySchema,
  sampleRateHz: z.number(),
  samples: z.number().int(),
  decimation: z.number().int(),
  t: z.array(z.number()),
  channels: z.array(
    z.object({ channel: z.number().int(), role: z.enum(['force', 'response']), dof: z.string().nullable(), unit: z.string(), sign: z.number(), kitItem: z.string(), sensitivity: z.number(), calibration: z.unknown(), values: z.array(z.number()) }),
  ),
  triggerTimeS: z.number(),
  forceWindow: z.object({ startS: z.number(), lengthS: z.number(), taperS: z.number() }),
  exponentialWindow: z.object({ startS: z.number(), tauS: z.number(), endLevelPercent: z.number() }).nullable(),
  forceSpectrum: z.object({
    f: z.array(z.number()),
    levelDb: z.array(z.number()),
    reference: z.string(),
    bandHz: z.object({ low: z.number(), high: z.number() }),
    rollOffDb: z.number(),
    rollOff10dBHz: z.number().nullable(),
    rollOff20dBHz: z.number().nullable(),
  }),
});
export type HitDetail = z.infer<typeof hitDetailSchema>;

export const overlayFrfSchema = z.object({
  entryId: z.string(),
  responseDof: z.string(),
  excitationDof: z.string(),
  averages: z.number().int(),
  f: z.array(z.number()),
  h1: complexJsonSchema,
  coherence: z.array(z.number()),
  meanCoherence: z.number().nullable(),
});
export const overlayAnswerSchema = z.object({ kind: frfKindSchema, unit: z.string(), frfs: z.array(overlayFrfSchema) });
export type OverlayFrf = z.infer<typeof overlayFrfSchema>;
export type OverlayAnswer = z.infer<typeof overlayAnswerSchema>;

const peakDifferenceSchema = z.object({ fHz: z.number(), dbDifference: z.number(), phaseDifferenceDeg: z.number(), peakShiftHz: z.number() });
const dofPairSchema = z.object({ response: z.string(), excitation: z.string() });
export const checksAnswerSchema = z.object({
  reciprocity: z.array(z.object({ a: dofPairSchema, b: dofPairSchema, axisConvention: z.string(), frac: z.number(), peaks: z.array(peakDifferenceSchema) })),
  linearity: z.array(z.object({ entry: dofPairSchema, lowForceN: z.number(), highForceN: z.number(), forceRatio: z.number(), hitsPerLevel: z.number().int(), frac: z.number(), peaks: z.array(peakDifferenceSchema) })),
  note: z.string(),
});
export type PeakDifference = z.infer<typeof peakDifferenceSchema>;
export type DofPair = z.infer<typeof dofPairSchema>;
export type ChecksAnswer = z.infer<typeof checksAnswerSchema>;
