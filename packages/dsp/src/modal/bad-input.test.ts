import { describe, expect, it } from 'vitest';
import { cmif, sumFrf } from './cmif.ts';
import { classifyPoles, pickStablePoles } from './stability.ts';
import { stabilizationDiagram } from './lscf.ts';
import { estimateShapes, synthesize } from './lsfd.ts';
import { macMatrix, mpc } from './shape-tools.ts';
import { axis, twoDof63 } from '../../test/modal-systems.ts';
import type { FrfSet } from './types.ts';
import { correctWindowDamping } from './window-correction.ts';

const good = () => twoDof63(axis(0, 0.5, 801), [0]); // 0…400 Hz
const opts = { bandHz: [50, 200] as [number, number], orders: [4, 6] };

describe('bad input gives a RangeError naming the value', () => {
  it('rejects a stabilization diagram from fewer than 2 FRFs (one response DOF)', () => {
    const set = good();
    const one: FrfSet = { ...set, frfs: [set.frfs[0]] };
    expect(() => stabilizationDiagram(one, opts)).toThrow(/1 response DOF .*at least 2/);
    expect(() => stabilizationDiagram({ ...set, frfs: [] }, opts)).toThrow(/frfs is empty/);
  });

  it('rejects FRFs whose length does not match the frequency axis', () => {
    const set = good();
    set.frfs[1] = { ...set.frfs[1], h: { re: set.frfs[1].h.re.subarray(0, 800), im: set.frfs[1].h.im } };
    expect(() => cmif(set)).toThrow(RangeError);
    expect(() => cmif(set)).toThrow(/frfs\[1\]\.h\.re has length 800 but frfSet\.f has length 801/);
  });

  it('rejects a band that is empty or holds no data lines', () => {
    expect(() => stabilizationDiagram(good(), { ...opts, bandHz: [300, 200] })).toThrow('bandHz [300, 200] Hz is empty');
    expect(() => stabilizationDiagram(good(), { ...opts, bandHz: [500, 600] })).toThrow(/\[500, 600\] Hz holds no lines of the frequency axis \(0–400 Hz\)/);
    expect(() => estimateShapes(good(), [{ fHz: 100, zeta: 0.01 }], { bandHz: [100.1, 100.4] })).toThrow(/holds no lines/);
  });

  it('rejects a band with fewer lines than the highest order needs', () => {
    expect(() => stabilizationDiagram(good(), { bandHz: [100, 105], orders: [20] })).toThrow(/holds 11 lines; order 20 needs at least 21/);
  });

  it('returns no poles for a band without modes, and estimateShapes says the pole list is empty', () => {
    // 250–400 Hz holds no mode of the 2-DOF (100.66 and 174.35 Hz)
    const d = stabilizationDiagram(good(), { bandHz: [250, 400], orders: [2, 4, 6] });
    expect(pickStablePoles(d)).toEqual([]);
    expect(() => estimateShapes(good(), pickStablePoles(d), { bandHz: [250, 400] })).toThrow(/poles is empty.*no stable modes/);
  });

  it('rejects orders below 2 and non-integer orders', () => {
    expect(() => stabilizationDiagram(good(), { ...opts, orders: [1, 4] })).toThrow('orders[0]=1 must be an integer ≥ 2');
    expect(() => stabilizationDiagram(good(), { ...opts, orders: [4.5] })).toThrow('orders[0]=4.5 must be an integer ≥ 2');
    expect(() => stabilizationDiagram(good(), { ...opts, orders: [] })).toThrow(/orders is empty/);
  });

  it('rejects NaN in an FRF, naming the FRF and the line', () => {
    const set = good();
    set.frfs[0].h.im[17] = Number.NaN;
    expect(() => stabilizationDiagram(set, opts)).toThrow('frfSet.frfs[0].h.im[17]=NaN is not finite');
    expect(() => sumFrf(set)).toThrow(/h\.im\[17\]=NaN/);
  });

  it('rejects a decreasing frequency axis, an unknown kind, a missing FRF of the grid and a repeated pair', () => {
    const set = good();
    const f = Float64Array.from(set.f);
    f[5] = f[4];
    expect(() => cmif({ ...set, f })).toThrow(/frfSet\.f\[5\]=2 Hz is not above frfSet\.f\[4\]=2 Hz/);
    expect(() => cmif({ ...set, kind: 'velocity' as never })).toThrow(/kind=velocity must be/);
    const two = twoDof63(axis(0, 0.5, 801), [0, 1]);
    expect(() => cmif({ ...two, frfs: two.frfs.slice(0, 3) })).toThrow(/lacks the FRF of response 2, reference 2/);
    expect(() => cmif({ ...set, frfs: [set.frfs[0], set.frfs[0]] })).toThrow(/repeats the pair \(response 1, reference 1\)/);
  });

  it('rejects bad poles, repeated poles, bad options and unknown FRF pairs in the shape fit', () => {
    const set = good();
    expect(() => estimateShapes(set, [{ fHz: -3, zeta: 0.01 }])).toThrow('poles[0].fHz=-3 must be > 0 and finite');
    expect(() => estimateShapes(set, [{ fHz: 100, zeta: 0 }])).toThrow('poles[0].zeta=0 must be between 0 and 1');
    expect(() => estimateShapes(set, [{ lambda: { re: 1, im: 600 } }])).toThrow(/lambda\.re=1 .*must be < 0/);
    expect(() => estimateShapes(set, [{ fHz: 100, zeta: 0.01 }, { fHz: 100, zeta: 0.01 }])).toThrow(/poles\[1\] repeats poles\[0\]/);
    const model = estimateShapes(set, [{ fHz: 100.6584, zeta: 0.01 }, { fHz: 174.3455, zeta: 0.02 }], { bandHz: [50, 200] });
    expect(() => synthesize(model, set.f, '3', '1', 'receptance')).toThrow(/no FRF of response 3, reference 1/);
    expect(() => synthesize(model, Float64Array.of(1, Number.NaN), '1', '1', 'receptance')).toThrow('f[1]=NaN Hz must be finite and ≥ 0');
    expect(() => stabilizationDiagram(set, { ...opts, dtS: 1 / 300 })).toThrow(/dtS=.* aliases the band/);
    expect(() => stabilizationDiagram(set, { ...opts, maxDampingRatio: 2 })).toThrow('maxDampingRatio=2 must be between 0 and 1');
    expect(() => classifyPoles([], [], { mac: 1.5 })).toThrow('tolerances.mac=1.5 must be > 0 and ≤ 1');
  });

  it('rejects all-zero shapes, length mismatches and bad window constants', () => {
    expect(() => mpc([0, 0, 0])).toThrow('shape is all zeros: MPC is undefined');
    expect(() => macMatrix([[1, 2]], [[1, 2, 3]])).toThrow(/shapesA\[0\] against shapesB\[0\]: .*lengths must match/);
    expect(() => correctWindowDamping([{ fHz: 50, zeta: 0.02 }], 0)).toThrow('tauS=0 must be > 0 and finite');
    // less damping than the window added (docs/methods.md#exp-window): no physical pole
    expect(() => correctWindowDamping([{ fHz: 50, zeta: 0.001 }], 0.21715)).toThrow(/poles\[0\]: zeta=0.001 at fnHz=50 is not above/);
  });
});
