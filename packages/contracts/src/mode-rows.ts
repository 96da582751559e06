// A row of a campaign's mode table as the API answers it (GET …/modes, the table's POST and
// DELETE, the hand-over): a mode with the fit, band, references, order and pole it came from.
import { z } from 'zod';

export const shapeValueSchema = z.object({ dof: z.string(), re: z.number(), im: z.number(), real: z.number() });
export type ShapeValue = z.infer<typeof shapeValueSchema>;

export const poleRefSchema = z.object({ order: z.number().int(), index: z.number().int() });
export type PoleRef = z.infer<typeof poleRefSchema>;

export const modeTableRowSchema = z.object({
  id: z.string(),
  mode: z.number().int(),
  fHz: z.number(),
  zetaPercent: z.number(),
  estimated: z.object({ fHz: z.number(), zetaPercent: z.number() }),
  mpc: z.number(),
  pole: poleRefSchema,
  source: z.object({ fitId: z.string().nullable(), bandHz: z.tuple([z.number(), z.number()]), references: z.array(z.string()), order: z.number().int(), poleIndex: z.number().int(), inputHash: z.string() }),
  shape: z.array(shapeValueSchema),
  /** Unit modal mass shape (1/√kg) where the fit had a driving point. */
  massShape: z.array(shapeValueSchema).nullable(),
  massNote: z.string(),
  duplicate: z.object({ of: z.number().int().nullable(), ofId: z.string().nullable(), note: z.string() }).nullable(),
  addedAt: z.string(),
});
export type ModeTableRow = z.infer<typeof modeTableRowSchema>;

/** The answer of a change to the mode table: its new version and every row. */
export const modeTableChangeSchema = z.object({ version: z.number().int(), added: z.array(z.string()).optional(), modes: z.array(modeTableRowSchema) });
