// The live input's meter readings (20 a second) and frame counts, held outside React state: only
// the meters and the frame line read them (useSyncExternalStore), so a reading re-renders those
// few elements and not the whole live panel, and the main thread stays free for the verdicts.
import { useSyncExternalStore } from 'react';
import type { MeterReading } from './capture-engine.ts';

export interface FrameCounts {
  seen: number;
  dropped: number;
  /** Frames the track reports dropped before the audio thread; null where the browser does not say. */
  upstream: number | null;
  /** Records with a break in the stream, not sent. */
  interrupted: number;
}

export interface Readings {
  meter: MeterReading | null;
  frames: FrameCounts;
}

export class ReadingStore {
  private value: Readings = { meter: null, frames: { seen: 0, dropped: 0, upstream: null, interrupted: 0 } };
  private listeners = new Set<() => void>();
  readonly subscribe = (listener: () => void) => {
    this.listeners.add(listener);
    return () => void this.listeners.delete(listener);
  };
  readonly get = () => this.value;
  set(change: Partial<Readings>) {
    this.value = { ...this.value, ...change };
    for (const l of this.listeners) l();
  }
}

export function useReadings(store: ReadingStore): Readings {
  return useSyncExternalStore(store.subscribe, store.get);
}
