// The reading of one channel of a background-noise check, as the API stores and serves it.

export interface NoiseChannelReading {
  channel: number;
  role: 'force' | 'response';
  dof: string;
  unit: 'N' | 'm/s²';
  /** Mean removed before the reading, in the channel's unit. */
  mean: number;
  /** RMS over the whole record and within the band of interest, in the channel's unit. */
  rms: number;
  rmsInBand: number;
  /** Largest |x − mean|, in the channel's unit. */
  peak: number;
  /** Tones standing out of the local floor: the tested frequency, the line found (Hz) and its height (dB). */
  tones: { testedHz: number; fHz: number; aboveFloorDb: number }[];
  status: 'ok' | 'caution';
  /** The reading in plain words with its numbers, as shown on Tap and in the report. */
  message: string;
}
