// The tips Tap offers for a strike: those registered for the hammer on the channel map (Kit, or the
// lab inventory item it was borrowed from), each with how the simulated rig plays it; when the
// hammer has none registered, the rig's own soft / medium / hard, and Tap says so.
import { useMemo } from 'react';
import { RIG_TIP_WORDS, rigHardnessOf, rigTipHardnesses, type RigTipHardness } from '@resonote/contracts';
import { useChannels, useKit } from '../../lib/campaign-data.ts';

export interface TipOption {
  /** The select's value: "tip:<name>" for a registered tip, "rig:<hardness>" for the rig's own. */
  value: string;
  label: string;
  hardness: RigTipHardness;
  /** The registered tip's name (sent as tipName and recorded with the hit), null for the rig's own. */
  name: string | null;
}

export interface HammerTips {
  options: TipOption[];
  /** The hammer on the channel map, as "model serial", or null while there is none or it is loading. */
  hammer: string | null;
  registered: boolean;
  loading: boolean;
}

export function useHammerTips(campaignId: string): HammerTips {
  const kit = useKit(campaignId);
  const channels = useChannels(campaignId);
  return useMemo(() => {
    const hammerId = channels.data?.channels.find((c) => c.kind === 'hammer')?.kitItemId;
    const item = kit.data?.items.find((i) => i.id === hammerId);
    const tips = item?.tips ?? [];
    const hammer = item ? `${item.model} ${item.serial}` : null;
    const loading = kit.isPending || channels.isPending;
    if (tips.length) {
      const options = tips.map((name) => {
        const hardness = rigHardnessOf(name);
        return { value: `tip:${name}`, label: name, hardness, name };
      });
      return { options, hammer, registered: true, loading };
    }
    const options = rigTipHardnesses.map((h) => ({ value: `rig:${h}`, label: RIG_TIP_WORDS[h], hardness: h, name: null }));
    return { options, hammer, registered: false, loading };
  }, [kit.data, kit.isPending, channels.data, channels.isPending]);
}
