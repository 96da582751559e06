// Which tip a simulated strike uses: a tip registered for the campaign's hammer (by its name,
// played by the rig as soft, medium or hard, contracts rigHardnessOf), or one of the rig's own three
// when the hammer has none registered. A name the hammer does not list is refused, so the tip
// recorded with a hit is always one the kit says the hammer has.
import { eq } from 'drizzle-orm';
import { rigHardnessOf, type RigTipHardness } from '@resonote/contracts';
import { kitItem } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { HttpError } from '../errors.ts';

export interface TipChoice {
  hardness: RigTipHardness;
  /** The registered tip's name, or null when the rig's own tip was chosen. */
  name: string | null;
}

/** The tip of a strike, checked against the hammer's registered tips (422 `tip-not-registered`). */
export async function tipChoice(db: Db, hammerKitItemId: string, asked: { tip?: RigTipHardness; tipName?: string }): Promise<TipChoice> {
  if (asked.tipName === undefined) return { hardness: asked.tip ?? 'medium', name: null };
  const [hammer] = await db.select({ tips: kitItem.tips, model: kitItem.model, serial: kitItem.serial }).from(kitItem).where(eq(kitItem.id, hammerKitItemId));
  const tips = hammer?.tips ?? [];
  const name = tips.find((t) => t.toLowerCase() === asked.tipName!.toLowerCase());
  if (!name) {
    const listed = tips.length ? `its registered tips are ${tips.map((t) => JSON.stringify(t)).join(', ')}` : 'it has no registered tips (send tip = soft, medium or hard for the rig’s own)';
    throw new HttpError(422, 'tip-not-registered', `The hammer ${hammer ? `${hammer.model} ${hammer.serial}` : 'on the channel map'} has no tip ${JSON.stringify(asked.tipName.slice(0, 60))}: ${listed}. Nothing was stored.`, { tips });
  }
  return { hardness: asked.tip ?? rigHardnessOf(name), name };
}

/** The hit's source text for a simulated strike, with the tip as chosen. */
export function tipSource(choice: TipChoice): string {
  return `tip=${choice.hardness}${choice.name ? `:tip-name=${encodeURIComponent(choice.name)}` : ''}`;
}
