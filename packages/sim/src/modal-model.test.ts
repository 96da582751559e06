import { describe, expect, it } from 'vitest';
import { dofLabel, parseDof } from './dof.ts';
import { compileModel, modeShapeValue, modelDofs, shapeVector, type ModalModel } from './modal-model.ts';

const model: ModalModel = {
  modes: [
    { fnHz: 10, zeta: 0.01, shape: { '1:+Z': 0.5, '2:+Z': -0.25 } },
    { fnHz: 20, zeta: 0.02, shape: { '1:+Z': 0.1, '2:-Z': 0.3, '2:+X': 0.7 } },
  ],
};

describe('DOF labels', () => {
  it('parses point, sign and axis and writes a canonical label', () => {
    expect(parseDof('12:+Z')).toMatchObject({ point: '12', axis: 'Z', sign: 1, label: '12:+Z', positive: '12:+Z' });
    expect(parseDof('P07:-Y')).toMatchObject({ point: 'P07', axis: 'Y', sign: -1, label: 'P07:-Y', positive: 'P07:+Y' });
  });

  it('accepts the Unicode minus used in docs/methods.md#dof-signs and writes it back as ASCII', () => {
    expect(parseDof('12:\u2212X').label).toBe('12:-X');
  });

  it('rejects malformed labels with a RangeError naming the label', () => {
    for (const bad of ['12Z', '12:Z', '12:+W', ':+Z', '12:+z']) {
      expect(() => parseDof(bad)).toThrow(RangeError);
      expect(() => parseDof(bad)).toThrow(bad);
    }
  });

  it('builds labels from point, axis and sign', () => {
    expect(dofLabel('B01', 'Z')).toBe('B01:+Z');
    expect(dofLabel('B01', 'Y', -1)).toBe('B01:-Y');
  });
});

describe('mode shapes at signed DOFs', () => {
  it('flips the sign for a negative direction (docs/methods.md#dof-signs: H(i, −d) = −H(i, +d))', () => {
    const mode = model.modes[0];
    expect(modeShapeValue(mode, '1:+Z')).toBe(0.5);
    expect(modeShapeValue(mode, '1:-Z')).toBe(-0.5);
  });

  it('reads a shape stored under a negative key as the negated positive direction', () => {
    const mode = model.modes[1];
    expect(modeShapeValue(mode, '2:+Z')).toBe(-0.3);
    expect(modeShapeValue(mode, '2:-Z')).toBe(0.3);
  });

  it('treats a direction a mode does not list as zero motion', () => {
    expect(modeShapeValue(model.modes[0], '2:+X')).toBe(0);
    expect(Array.from(shapeVector(compileModel(model), '2:-X'))).toEqual([-0, -0.7]);
  });

  it('gives one value per mode for a DOF, and rejects points not in the model', () => {
    const compiled = compileModel(model);
    expect(Array.from(shapeVector(compiled, '2:+Z'))).toEqual([-0.25, -0.3]);
    expect(() => shapeVector(compiled, '9:+Z')).toThrow(/dof="9:\+Z".*not in the model/);
  });

  it('lists the model DOFs in their positive direction', () => {
    expect(modelDofs(model).sort()).toEqual(['1:+Z', '2:+X', '2:+Z']);
  });
});

describe('model validation', () => {
  it('rejects damping outside (0, 1) for an elastic mode, naming the value', () => {
    expect(() => compileModel({ modes: [{ fnHz: 10, zeta: 0, shape: { '1:+Z': 1 } }] })).toThrow(/zeta=0/);
    expect(() => compileModel({ modes: [{ fnHz: 10, zeta: 1.2, shape: { '1:+Z': 1 } }] })).toThrow(/zeta=1.2/);
  });

  it('rejects a NaN or negative frequency and a NaN shape value', () => {
    expect(() => compileModel({ modes: [{ fnHz: Number.NaN, zeta: 0.01, shape: { '1:+Z': 1 } }] })).toThrow(/fnHz=NaN/);
    expect(() => compileModel({ modes: [{ fnHz: -1, zeta: 0.01, shape: { '1:+Z': 1 } }] })).toThrow(/fnHz=-1/);
    expect(() => compileModel({ modes: [{ fnHz: 5, zeta: 0.01, shape: { '1:+Z': Number.NaN } }] })).toThrow(/NaN/);
  });

  it('rejects a shape that gives both directions of one DOF', () => {
    expect(() => compileModel({ modes: [{ fnHz: 5, zeta: 0.01, shape: { '1:+Z': 1, '1:-Z': 1 } }] })).toThrow(RangeError);
  });

  it('accepts a rigid-body mode (fnHz = 0) whatever its zeta', () => {
    expect(compileModel({ modes: [{ fnHz: 0, zeta: 0, shape: { '1:+Z': 1 } }] }).omega[0]).toBe(0);
  });

  it('rejects an empty model', () => {
    expect(() => compileModel({ modes: [] })).toThrow(RangeError);
  });
});
