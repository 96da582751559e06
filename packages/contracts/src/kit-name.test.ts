import { describe, expect, it } from 'vitest';
import { kitItemName, kitModelName } from './kit-name.ts';

describe('kit item names', () => {
  it('puts the kind before a bare model name', () => {
    expect(kitItemName({ kind: 'accelerometer', model: 'AC-10', serial: 'A200' })).toBe('Accelerometer AC-10 (SN A200)');
    expect(kitModelName('hammer', 'IH-02')).toBe('Hammer IH-02');
  });

  it('does not say the kind twice when the model already names it', () => {
    expect(kitItemName({ kind: 'accelerometer', model: 'Accelerometer AC-10 (demo)', serial: 'A-5521' })).toBe('Accelerometer AC-10 (demo) (SN A-5521)');
    expect(kitModelName('hammer', 'Impact hammer IH-02 (demo)')).toBe('Impact hammer IH-02 (demo)');
    expect(kitModelName('accelerometer', 'accel. AC-10')).toBe('accel. AC-10');
  });

  it('keeps a model that only begins with the same letters', () => {
    expect(kitModelName('hammer', 'Hammerhead 3')).toBe('Hammer Hammerhead 3');
  });
});
