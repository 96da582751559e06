// How a kit item is named in messages and lists: kind, model, serial — without saying the kind
// twice when the model already starts with it ("Accelerometer AC-10", not "Accelerometer
// Accelerometer AC-10"; "Impact hammer IH-02" stays as it is).
export type KitKindName = 'hammer' | 'accelerometer';

const kindWord: Record<KitKindName, { word: string; alsoMatches: RegExp }> = {
  hammer: { word: 'Hammer', alsoMatches: /^(impact\s+)?hammer\b/i },
  accelerometer: { word: 'Accelerometer', alsoMatches: /^(accelerometer|accel\.?)(\s|$)/i },
};

/** "Accelerometer AC-10", or the model alone when it names its kind already. */
export function kitModelName(kind: KitKindName, model: string): string {
  const m = model.trim();
  const k = kindWord[kind];
  return k.alsoMatches.test(m) ? m : `${k.word} ${m}`;
}

/** "Accelerometer AC-10 (SN A-5521)". */
export function kitItemName(item: { kind: KitKindName; model: string; serial: string }): string {
  return `${kitModelName(item.kind, item.model)} (SN ${item.serial})`;
}
