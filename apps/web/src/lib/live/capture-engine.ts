// The acquisition of the live input, as pure TypeScript with no browser API: a ring buffer per
// channel, a trigger on the force channel in newtons with slope and hysteresis, pre-trigger and
// record length from the acquisition settings, per-channel level meters with headroom and overload.
// The AudioWorklet (capture-worklet.ts) is a thin wrapper that feeds it the 128-frame blocks the
// audio thread hands over; the unit tests and bench/live-samples.ts feed it the same way.
// Method: docs/methods.md#live-trigger.

export type Slope = 'rising' | 'falling';

export interface CaptureOptions {
  channels: number;
  sampleRateHz: number;
  /** Index (0-based, in the stream) of the force channel. */
  forceChannel: number;
  /** Newtons per digital unit on the force channel: fullScaleVolts × 1000 / sensitivity (mV/N). */
  forceNPerUnit: number;
  /** Trigger level in N (settings.triggerLevelN), > 0. */
  triggerLevelN: number;
  /** rising: force goes up through +level; falling: down through −level (a hammer wired with reversed sign). */
  slope: Slope;
  /** Fraction of the level the force must fall back below before the next trigger, 0–1. */
  hysteresis: number;
  preTriggerSamples: number;
  recordSamples: number;
  /** Frames between two meter readings. */
  meterFrames: number;
}

export interface CapturedRecord {
  /** Stream frame index of the first sample of the record (the trigger frame minus the pre-trigger). */
  startFrame: number;
  /** Stream frame index of the trigger crossing. */
  triggerFrame: number;
  /** One array per channel, digital units (full scale = ±1). */
  channels: Float32Array[];
  /** Largest |sample| per channel within the record, digital units. */
  peaks: number[];
  /**
   * Breaks in the input stream inside the record (docs/methods.md#stream-break): frames reported
   * lost by `markBreak` while the record was open, and the longest run of frames in which every
   * channel was exactly 0 (what a starved stream delivers instead of samples). A record with
   * either is not a measurement of one hit and must not be uploaded as one.
   */
  lostFrames: number;
  silentRun: number;
}

export interface MeterReading {
  /** Frame index at the end of the window. */
  frame: number;
  /** Largest |sample| per channel in the window, digital units. */
  peaks: number[];
  /** Headroom per channel: 20·log10(1 / peak) dB below full scale (Infinity for silence). */
  headroomDb: number[];
  /** Within 1 dB of full scale (peak ≥ 10^(−1/20) ≈ 0.891). */
  overload: boolean[];
}

export type CaptureState = 'armed' | 'recording';

/**
 * A run of this many frames with every channel exactly 0 inside a record is a break in the stream,
 * not a signal: a live interface's noise spans several LSBs, and a sensor with a hammer attached is
 * never digital silence for 32 frames (0.7 ms at 44.1 kHz) while it rings. Common practice.
 */
export const SILENT_RUN_FRAMES = 32;

/** Peak at or above this is "within 1 dB of full scale" (10^(−1/20)). */
export const OVERLOAD_PEAK = 10 ** (-1 / 20);

export function headroomDb(peak: number): number {
  return peak > 0 ? -20 * Math.log10(peak) : Infinity;
}

function check(o: CaptureOptions) {
  if (!Number.isInteger(o.channels) || o.channels < 1) throw new RangeError(`channels=${o.channels} must be a whole number ≥ 1`);
  if (!(o.sampleRateHz > 0)) throw new RangeError(`sampleRateHz=${o.sampleRateHz} must be > 0`);
  if (!Number.isInteger(o.forceChannel) || o.forceChannel < 0 || o.forceChannel >= o.channels) throw new RangeError(`forceChannel=${o.forceChannel} must be in 0…${o.channels - 1}`);
  if (!(o.forceNPerUnit > 0)) throw new RangeError(`forceNPerUnit=${o.forceNPerUnit} must be > 0`);
  if (!(o.triggerLevelN > 0)) throw new RangeError(`triggerLevelN=${o.triggerLevelN} must be > 0`);
  if (!(o.hysteresis >= 0 && o.hysteresis < 1)) throw new RangeError(`hysteresis=${o.hysteresis} must be in [0, 1)`);
  if (!Number.isInteger(o.recordSamples) || o.recordSamples < 2) throw new RangeError(`recordSamples=${o.recordSamples} must be a whole number ≥ 2`);
  if (!Number.isInteger(o.preTriggerSamples) || o.preTriggerSamples < 0 || o.preTriggerSamples >= o.recordSamples) throw new RangeError(`preTriggerSamples=${o.preTriggerSamples} must be in 0…recordSamples−1`);
  if (!Number.isInteger(o.meterFrames) || o.meterFrames < 1) throw new RangeError(`meterFrames=${o.meterFrames} must be a whole number ≥ 1`);
}

/**
 * Triggered capture over a continuous multi-channel stream.
 *
 * Trigger (docs/methods.md#live-trigger): with s = +1 (rising) or −1 (falling), the record starts
 * at the first frame where s·F ≥ level while the trigger is re-armed; it re-arms once s·F has
 * fallen below level·(1 − hysteresis). A record spans `preTriggerSamples` before the trigger frame
 * and `recordSamples` in all; a second pulse inside a record stays in it (the server's double-hit
 * check sees it). The next trigger can come from the first frame after a record ends.
 * Ring buffer: `recordSamples` frames per channel, so a record is complete in it when its last frame arrives.
 */
export class CaptureEngine {
  readonly options: CaptureOptions;
  private readonly ring: Float32Array[];
  private readonly cap: number;
  /** Frames seen so far (the stream frame index of the next frame). */
  private frame = 0;
  private rearmed = true;
  private recordStart = -1;
  private recordTrigger = -1;
  private readonly recordPeaks: number[];
  private readonly meterPeaks: number[];
  private meterCount = 0;
  private readonly levelUnits: number;
  private readonly rearmUnits: number;
  private readonly sign: number;
  private recordLost = 0;
  private zeroRun = 0;
  private recordSilentRun = 0;
  /** Frame after the last run of all-zero frames, and its length. */
  private lastRunEnd = -1;
  private lastRunLength = 0;

  constructor(options: CaptureOptions) {
    check(options);
    this.options = { ...options };
    this.cap = options.recordSamples;
    this.ring = Array.from({ length: options.channels }, () => new Float32Array(this.cap));
    this.recordPeaks = new Array<number>(options.channels).fill(0);
    this.meterPeaks = new Array<number>(options.channels).fill(0);
    this.levelUnits = options.triggerLevelN / options.forceNPerUnit;
    this.rearmUnits = this.levelUnits * (1 - options.hysteresis);
    this.sign = options.slope === 'rising' ? 1 : -1;
  }

  get framesSeen(): number {
    return this.frame;
  }

  get state(): CaptureState {
    return this.recordStart >= 0 ? 'recording' : 'armed';
  }

  /**
   * Tells the engine that `frames` frames of the stream were lost before the next block (the audio
   * thread skipped them, or the source reported them dropped). A record open now, or starting
   * within its pre-trigger of now, is marked broken.
   */
  markBreak(frames: number): void {
    if (!(frames > 0)) return;
    this.pendingBreak += frames;
  }

  private pendingBreak = 0;
  private lostBeforeNext = 0;
  /** Frame up to which a break still reaches into a record's pre-trigger. */
  private brokenUntil = -1;

  /**
   * Feeds one block (one array per channel, all of the same length). Calls `onRecord` for every
   * record completed inside the block and `onMeter` at every `meterFrames` frames.
   */
  process(block: ArrayLike<number>[], onRecord: (r: CapturedRecord) => void, onMeter?: (m: MeterReading) => void): void {
    const { channels, forceChannel, preTriggerSamples, recordSamples, meterFrames } = this.options;
    if (block.length !== channels) throw new RangeError(`block has ${block.length} channels, expected ${channels}`);
    const frames = block[0]!.length;
    for (let c = 1; c < channels; c++) if (block[c]!.length !== frames) throw new RangeError(`channel ${c} has ${block[c]!.length} frames, channel 0 has ${frames}`);
    const force = block[forceChannel]!;
    if (this.pendingBreak > 0) {
      if (this.recordStart >= 0) this.recordLost += this.pendingBreak;
      // A record that starts later but whose pre-trigger reaches back over the break holds it too.
      this.brokenUntil = this.frame + preTriggerSamples;
      this.lostBeforeNext = this.pendingBreak;
      this.pendingBreak = 0;
    }
    for (let i = 0; i < frames; i++) {
      const at = this.frame % this.cap;
      let silent = true;
      for (let c = 0; c < channels; c++) {
        const v = block[c]![i]!;
        this.ring[c]![at] = v;
        if (v !== 0) silent = false;
        const a = v < 0 ? -v : v;
        if (a > this.meterPeaks[c]!) this.meterPeaks[c] = a;
        if (this.recordStart >= 0 && a > this.recordPeaks[c]!) this.recordPeaks[c] = a;
      }
      if (silent) this.zeroRun += 1;
      else if (this.zeroRun > 0) {
        this.lastRunEnd = this.frame;
        this.lastRunLength = this.zeroRun;
        this.zeroRun = 0;
      }
      if (this.recordStart >= 0 && this.zeroRun > this.recordSilentRun) this.recordSilentRun = this.zeroRun;
      const f = this.sign * force[i]!;
      if (this.recordStart < 0) {
        if (!this.rearmed && f < this.rearmUnits) this.rearmed = true;
        // The pre-trigger must be in the ring: not before the stream had that many frames.
        if (this.rearmed && f >= this.levelUnits && this.frame >= preTriggerSamples) {
          this.recordStart = this.frame - preTriggerSamples;
          this.recordTrigger = this.frame;
          this.rearmed = false;
          this.recordLost = this.frame < this.brokenUntil ? this.lostBeforeNext : 0;
          // A silent run that ended inside the pre-trigger is inside the record.
          this.recordSilentRun = this.lastRunEnd > this.recordStart ? Math.min(this.lastRunLength, this.lastRunEnd - this.recordStart) : 0;
          for (let c = 0; c < channels; c++) {
            let peak = 0;
            for (let k = this.recordStart; k <= this.frame; k++) {
              const v = this.ring[c]![k % this.cap]!;
              const a = v < 0 ? -v : v;
              if (a > peak) peak = a;
            }
            this.recordPeaks[c] = peak;
          }
        }
      } else if (!this.rearmed && f < this.rearmUnits) {
        this.rearmed = true;
      }
      this.frame += 1;
      if (this.recordStart >= 0 && this.frame - this.recordStart === recordSamples) {
        const out = this.ring.map((r) => {
          const copy = new Float32Array(recordSamples);
          const from = this.recordStart % this.cap;
          copy.set(r.subarray(from));
          copy.set(r.subarray(0, from), this.cap - from);
          return copy;
        });
        onRecord({ startFrame: this.recordStart, triggerFrame: this.recordTrigger, channels: out, peaks: [...this.recordPeaks], lostFrames: this.recordLost, silentRun: this.recordSilentRun });
        this.recordLost = 0;
        this.recordSilentRun = 0;
        this.recordStart = -1;
        this.recordTrigger = -1;
        this.recordPeaks.fill(0);
      }
      this.meterCount += 1;
      if (this.meterCount === meterFrames) {
        if (onMeter) {
          const peaks = [...this.meterPeaks];
          onMeter({ frame: this.frame, peaks, headroomDb: peaks.map(headroomDb), overload: peaks.map((p) => p >= OVERLOAD_PEAK) });
        }
        this.meterPeaks.fill(0);
        this.meterCount = 0;
      }
    }
  }
}

/** Samples of a record for the settings: round(fs·T) and round(fs·pre), as the server cuts uploads. */
export function recordFrames(sampleRateHz: number, recordLengthS: number, preTriggerS: number): { recordSamples: number; preTriggerSamples: number } {
  return { recordSamples: Math.round(sampleRateHz * recordLengthS), preTriggerSamples: Math.round(sampleRateHz * preTriggerS) };
}
