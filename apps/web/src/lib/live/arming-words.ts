// Why the live input could not arm, in words an engineer can act on: the browser's refusals of
// getUserMedia by their DOMException names (W3C Media Capture and Streams, §getUserMedia errors),
// an audio context that does not start, and an interface with fewer channels than the channel map.

export function armingFailure(err: unknown): string {
  const name = err instanceof DOMException || err instanceof Error ? err.name : '';
  const detail = err instanceof Error && err.message ? ` (${err.message})` : '';
  switch (name) {
    case 'NotAllowedError':
    case 'SecurityError':
      return `Access to the audio input was refused${detail}. Allow this site to use the microphone in the browser's site settings, then start again.`;
    case 'NotFoundError':
      return `No audio input was found${detail}. Connect the interface (and switch it on), then start again.`;
    case 'OverconstrainedError': {
      const c = (err as { constraint?: string }).constraint;
      return `The chosen input cannot deliver what was asked${c ? ` (${c === 'deviceId' ? 'that device is not connected' : `constraint ${c}`})` : ''}. Choose another input in the list, then start again.`;
    }
    case 'NotReadableError':
    case 'AbortError':
      return `The audio input is in use or failed to open${detail}. Close other programs using the interface, then start again.`;
    default:
      return `The live input could not start${detail || `: ${String(err)}`}.`;
  }
}

/** The audio context is not running after start (a browser that blocks audio until a gesture, or no output device). */
export function contextNotRunning(state: string): string {
  return `The browser's audio processing did not start (state: ${state}). Click Start again; if it stays so, check that the browser may play audio on this site.`;
}

/** The interface delivers fewer channels than the channel map's highest channel number. */
export function tooFewChannels(delivered: number, needed: number): string {
  return `The input delivers ${delivered} channel${delivered === 1 ? '' : 's'}, but the channel map needs ${needed} (interface input n is channel n). Choose a multi-channel interface, or change the channel map in Kit.`;
}
