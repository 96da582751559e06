import { describe, expect, it } from 'vitest';
import { thumbnailSize } from './photo-thumbnail.ts';

describe('thumbnailSize', () => {
  it('scales a 4000 × 3000 phone photo to 320 × 240, keeping its 4:3 aspect', () => {
    // 320 / 4000 = 0.08; 3000 × 0.08 = 240 (arithmetic).
    expect(thumbnailSize(4000, 3000)).toEqual({ width: 320, height: 240 });
  });
  it('scales a portrait photo by its longer side', () => {
    // 320 / 4032 × 3024 = 240.0 (arithmetic).
    expect(thumbnailSize(3024, 4032)).toEqual({ width: 240, height: 320 });
  });
  it('never enlarges a photo already smaller than the thumbnail', () => {
    expect(thumbnailSize(160, 120)).toEqual({ width: 160, height: 120 });
  });
  it('refuses a photo without a size', () => {
    expect(() => thumbnailSize(0, 120)).toThrow(RangeError);
  });
});
