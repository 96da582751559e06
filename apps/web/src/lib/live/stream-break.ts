// Breaks in the live input's stream that happen upstream of the AudioWorklet (the capture device
// or the browser's capture path dropped frames before they reached the audio thread), read from
// MediaStreamTrack.stats (W3C Media Capture Extensions, MediaStreamTrackAudioStats: totalFrames
// counts frames the source produced, deliveredFrames those it delivered; the difference is
// dropped). The page reads the counter with every meter reading of the worklet and keeps it
// against the worklet's frame count; a record is broken when the counter rose after the last
// reading taken before the record began (docs/methods.md#stream-break).

export interface DropReading {
  /** Worklet frame count when the reading was taken (frames seen so far). */
  frame: number;
  /** Frames dropped upstream so far (totalFrames − deliveredFrames of the track). */
  dropped: number;
}

/** What a track's stats say about dropped frames, or null where the browser has no such stats. */
export function trackDroppedFrames(track: MediaStreamTrack): number | null {
  const stats = (track as MediaStreamTrack & { stats?: { totalFrames?: number; deliveredFrames?: number } }).stats;
  if (!stats || typeof stats.totalFrames !== 'number' || typeof stats.deliveredFrames !== 'number') return null;
  return Math.max(0, stats.totalFrames - stats.deliveredFrames);
}

/**
 * Readings of the upstream drop counter against the worklet's frames. `keepFrames` bounds the
 * history (a record plus the margin is enough).
 */
export class DropLedger {
  private readings: DropReading[] = [];
  constructor(private readonly keepFrames: number) {
    if (!(keepFrames > 0)) throw new RangeError(`keepFrames=${keepFrames} must be > 0`);
  }

  add(reading: DropReading): void {
    const last = this.readings[this.readings.length - 1];
    if (last && reading.frame < last.frame) throw new RangeError(`frame=${reading.frame} is before the last reading's ${last.frame}`);
    this.readings.push(reading);
    const oldest = reading.frame - this.keepFrames;
    while (this.readings.length > 2 && this.readings[1]!.frame <= oldest) this.readings.shift();
  }

  /**
   * Frames dropped upstream since the last reading taken at or before `frame` up to `nowDropped`.
   * Without a reading that old every drop seen so far counts (the record cannot be cleared).
   */
  droppedSince(frame: number, nowDropped: number): number {
    let base: DropReading | undefined;
    for (const r of this.readings) if (r.frame <= frame) base = r;
    return Math.max(0, nowDropped - (base?.dropped ?? 0));
  }
}

/**
 * Why a record is not a measurement of one hit, in words, or null when its stream was whole.
 * `lostInWorklet`: frames the audio thread skipped inside it; `silentRun`: longest run of frames
 * with every channel exactly 0 in it; `droppedUpstream`: frames the source dropped meanwhile.
 */
export function streamBreak(b: { lostInWorklet: number; silentRun: number; droppedUpstream: number }, silentRunLimit: number, fs: number): string | null {
  const ms = (n: number) => `${((n / fs) * 1000).toFixed(1)} ms`;
  const parts: string[] = [];
  if (b.droppedUpstream > 0) parts.push(`${b.droppedUpstream} frames (${ms(b.droppedUpstream)}) dropped before the browser's audio thread`);
  if (b.lostInWorklet > 0) parts.push(`${b.lostInWorklet} frames (${ms(b.lostInWorklet)}) skipped by the audio thread`);
  if (b.silentRun >= silentRunLimit) parts.push(`${b.silentRun} frames (${ms(b.silentRun)}) of digital silence on every channel`);
  return parts.length ? parts.join('; ') : null;
}
