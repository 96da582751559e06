// The hammer tips Tap offers: the tips registered for the campaign's hammer (Kit, or the lab
// inventory item it was borrowed from), each played by the simulated rig as one of its three
// contact times. Which names count as soft, medium or hard is common practice in impact testing
// (rubber and other elastomers soft, plastics medium, metals hard; Ewins 2000, Modal Testing, ch. 3).
export const rigTipHardnesses = ['soft', 'medium', 'hard'] as const;
export type RigTipHardness = (typeof rigTipHardnesses)[number];

const SOFT = /\b(soft|rubber|elastomer|silicone|super ?soft|extra ?soft|polyurethane|urethane)\b/i;
const HARD = /\b(hard|steel|metal|stainless|aluminium|aluminum|titanium|brass|tungsten)\b/i;
const MEDIUM = /\b(medium|plastic|nylon|delrin|acetal|vinyl|pvc)\b/i;

/**
 * How the simulated rig plays a registered tip: by the words of its name (soft/rubber → soft,
 * medium/plastic → medium, hard/steel/metal → hard, checked in that order of specificity: "soft"
 * and "hard" win over the material); a name that says none of these plays as medium.
 */
export function rigHardnessOf(tipName: string): RigTipHardness {
  if (/\bmedium\b/i.test(tipName)) return 'medium';
  if (/\bsoft\b/i.test(tipName)) return 'soft';
  if (/\bhard\b/i.test(tipName)) return 'hard';
  if (SOFT.test(tipName)) return 'soft';
  if (HARD.test(tipName)) return 'hard';
  if (MEDIUM.test(tipName)) return 'medium';
  return 'medium';
}

/** The rig's own tips, offered when the hammer has none registered. */
export const RIG_TIP_WORDS: Record<RigTipHardness, string> = {
  soft: 'Soft — long pulse, low band',
  medium: 'Medium',
  hard: 'Hard — short pulse, wide band',
};
