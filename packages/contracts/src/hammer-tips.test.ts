import { describe, expect, it } from 'vitest';
import { rigHardnessOf } from './hammer-tips.ts';

// Tip materials by hardness: common practice in impact testing (Ewins 2000, Modal Testing, ch. 3).
describe('rigHardnessOf', () => {
  it('plays rubber and other soft tips as the soft tip', () => {
    expect(rigHardnessOf('soft rubber')).toBe('soft');
    expect(rigHardnessOf('Silicone')).toBe('soft');
  });
  it('plays metal tips as the hard tip', () => {
    expect(rigHardnessOf('steel')).toBe('hard');
    expect(rigHardnessOf('Aluminium cap')).toBe('hard');
  });
  it('plays plastic tips and names that say nothing as the medium tip', () => {
    expect(rigHardnessOf('nylon')).toBe('medium');
    expect(rigHardnessOf('red tip #3')).toBe('medium');
  });
  it('lets the words soft, medium and hard win over the material', () => {
    expect(rigHardnessOf('hard plastic')).toBe('hard');
    expect(rigHardnessOf('medium rubber')).toBe('medium');
  });
});
