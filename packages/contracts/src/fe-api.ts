// Request bodies of the FE-model routes (apps/api/src/routes/fe-models.ts), shared with the web app.
import { z } from 'zod';
import { dofLabelSchema, pointLabelSchema, versionSchema } from './common.ts';
import { MAX_FE_CHARS } from './fe-model.ts';

export const feVersionLabelSchema = z
  .string()
  .trim()
  .min(1, 'give the model version a label, for example v1')
  .max(60, 'a version label has at most 60 characters');

export const feModelUploadSchema = z.strictObject({
  /** The file's text (CSV or JSON, docs/fe-model-format.md). */
  text: z.string().min(1, 'the model file is empty').max(MAX_FE_CHARS, `a model file takes at most ${MAX_FE_CHARS} characters`),
  /** 'csv' or 'json'; guessed from the file name or the first character when left out. */
  format: z.enum(['csv', 'json']).optional(),
  versionLabel: feVersionLabelSchema,
  /** Shown name; the file's own name record when left out. */
  name: z.string().trim().min(1).max(200).optional(),
  fileName: z.string().max(255).optional(),
});
export type FeModelUpload = z.infer<typeof feModelUploadSchema>;

export const feAutoMapSchema = z.strictObject({
  by: z.enum(['label', 'nearest']),
  /** Largest distance in mm for 'nearest'. */
  toleranceMm: z.number().positive('the tolerance must be > 0 mm').max(100_000).optional(),
});

export const feMapEditSchema = z.strictObject({
  /** The map's version as last read. */
  version: versionSchema,
  /** Links to set; a point not listed keeps its link. node: null removes the link. */
  links: z
    .array(z.strictObject({ point: pointLabelSchema, node: pointLabelSchema.nullable() }))
    .min(1, 'send at least one link')
    .max(20_000),
});

export const feAxes = ['X', 'Y', 'Z'] as const;

export const feProposalSchema = z
  .strictObject({
    /** Modes of interest: those with a frequency in [low, high] Hz … */
    bandHz: z.tuple([z.number().min(0), z.number().positive()]).optional(),
    /** … or the model's mode numbers. Neither: every mode of the model. */
    modes: z.array(z.number().int().min(1)).min(1).max(200).optional(),
    /** 'nodes': every model node × axes; 'points': the campaign's mapped points × axes. */
    candidates: z.enum(['nodes', 'points']).default('nodes'),
    axes: z.array(z.enum(feAxes)).min(1).max(3).default(['Z']),
    /** Number of DOFs to keep (sensors); at least the number of modes. */
    sensors: z.number().int().min(1).max(5000),
    /** Off-diagonal auto-MAC at or above which two modes count as hard to tell apart (0.2 default, common practice). */
    threshold: z.number().min(0).max(1).default(0.2),
    /** DOFs never deleted (sensors already placed). */
    keep: z.array(dofLabelSchema).max(500).optional(),
  })
  .refine((b) => !(b.bandHz && b.modes), { message: 'give either bandHz or modes, not both' })
  .refine((b) => !b.bandHz || b.bandHz[0] < b.bandHz[1], { message: 'bandHz must be [low, high] with low < high', path: ['bandHz'] });
export type FeProposalRequest = z.input<typeof feProposalSchema>;

export const feAcceptSchema = z.strictObject({
  /** The DOFs to measure (the proposal's kept set, possibly edited), `node:+Z`. */
  dofs: z.array(dofLabelSchema).min(1, 'choose at least one DOF').max(5000),
  /** The reference DOF (accelerometer for roving hammer, hammer for roving response). */
  reference: dofLabelSchema,
  requiredHits: z.number().int().min(1).max(100).optional(),
  /** The campaign's version as last read (its reference DOFs change). */
  campaignVersion: versionSchema,
});

export const feCorrelationQuerySchema = z.strictObject({
  /** Smallest MAC that may pair two modes (0.6 default, Resonote's choice). */
  minMac: z.coerce.number().min(0).max(1).optional(),
});
