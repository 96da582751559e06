// A spring–mass chain with known M and K: its modes from scipy.linalg.eigh (tests/reference/chain_modes.py),
// and unit-modal-mass shapes from one fit checked by φᵀMφ = I.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { estimateShapes, massNormalisedShapes, stabilizationDiagram, suggestModes } from '../src/modal/index.ts';
import { hasScipy } from './fixture-scripts.ts';
import { loadFixture, repoRoot } from './helpers.ts';
import { chainMatrices, lines, measure, type ClosedFormModel } from './structures.ts';

const dir = resolve(repoRoot, 'tests/fixtures/structures');
const ref = loadFixture<{ masses: number[]; springs: number[]; fHz: number[]; phi: number[][] }>('chain.json', dir);
const { M, K, n } = chainMatrices(ref.masses, ref.springs);

describe('spring–mass chain (scipy.linalg.eigh of K, M)', () => {
  it('has reference modes with Kφ = ω²Mφ and φᵀMφ = I for the M and K built here', () => {
    for (let r = 0; r < n; r++) {
      const w2 = (2 * Math.PI * ref.fHz[r]) ** 2;
      const phi = ref.phi[r];
      for (let i = 0; i < n; i++) {
        let kp = 0;
        let mp = 0;
        for (let j = 0; j < n; j++) {
          kp += K[i * n + j] * phi[j];
          mp += M[i * n + j] * phi[j];
        }
        expect(Math.abs(kp - w2 * mp)).toBeLessThan(1e-8 * w2);
      }
      for (let s = 0; s < n; s++) {
        let g = 0;
        for (let i = 0; i < n; i++) g += ref.phi[s][i] * M[i * n + i] * phi[i];
        expect(g).toBeCloseTo(r === s ? 1 : 0, 10);
      }
    }
  });

  it.skipIf(!hasScipy)('reference fixture is reproduced by tests/reference/chain_modes.py (skipped without scipy)', () => {
    const out = mkdtempSync(join(tmpdir(), 'chain-'));
    try {
      execFileSync('python3', [resolve(repoRoot, 'tests/reference/chain_modes.py'), out], { stdio: 'pipe' });
      const fresh = loadFixture<typeof ref>('chain.json', out);
      expect(fresh.fHz).toHaveLength(ref.fHz.length);
      fresh.fHz.forEach((f, r) => expect(f).toBeCloseTo(ref.fHz[r], 9));
    } finally {
      rmSync(out, { recursive: true, force: true });
    }
  });

  it('gives unit-modal-mass shapes from the driving point: φᵀMφ = I within 3 % (Ewins 2000, §2.7)', () => {
    const model: ClosedFormModel = {
      dofs: ref.masses.map((_, i) => `m${i + 1}:+X`),
      modes: ref.fHz.map((f, r) => ({ fHz: f, zeta: 0.01 + 0.002 * (r % 3), phi: Float64Array.from(ref.phi[r]), label: `mode ${r + 1}` })),
    };
    // hammer on mass 3, accelerometers on all 8 (so m3 is the driving point); T = 4 s, window to 1 %
    const tau = 4 / Math.log(100);
    const set = measure(model, { f: lines(0.25, 1201), responses: model.dofs.map((_, i) => i), references: [2], kind: 'accelerance', tauS: tau, noise: { relative: 0.002, floor: 5e-5, seed: 21 } });
    const d = stabilizationDiagram(set, { bandHz: [10, 230], orders: Array.from({ length: 20 }, (_, i) => 2 * i + 2) });
    const sm = suggestModes(d);
    expect(sm).toHaveLength(8);
    const poles = sm.map((m) => d.orders.find((o) => o.order === m.representative.order)!.poles[m.representative.index]);
    poles.forEach((p, r) => expect(Math.abs(p.fHz / ref.fHz[r] - 1)).toBeLessThan(1e-3));
    const mn = massNormalisedShapes(estimateShapes(set, poles.map((p) => ({ lambda: p.lambda })), { bandHz: [10, 230] }));
    expect(mn.drivingPoint).toBe('m3:+X');
    for (let r = 0; r < n; r++) {
      for (let s = 0; s < n; s++) {
        let g = 0;
        for (let i = 0; i < n; i++) g += mn.modes[r].realPhi[i] * M[i * n + i] * mn.modes[s].realPhi[i];
        // φᵀMφ = I with M from tests/reference/chain_modes.py; 3 % on the diagonal, 0.03 off it
        if (r === s) expect(Math.abs(g - 1), `mode ${r + 1}`).toBeLessThan(0.03);
        else expect(Math.abs(g), `modes ${r + 1}, ${s + 1}`).toBeLessThan(0.03);
      }
    }
  });

  it('says so plainly when the model has no driving point', () => {
    const model: ClosedFormModel = { dofs: ref.masses.map((_, i) => `m${i + 1}:+X`), modes: ref.fHz.map((f, r) => ({ fHz: f, zeta: 0.01, phi: Float64Array.from(ref.phi[r]), label: '' })) };
    const set = measure(model, { f: lines(0.25, 1201), responses: [0, 1, 3, 4, 5, 6, 7], references: [2], kind: 'receptance' });
    const poles = ref.fHz.map((f) => ({ fHz: f, zeta: 0.01 }));
    const mn = massNormalisedShapes(estimateShapes(set, poles, { bandHz: [10, 230] }));
    expect(mn.drivingPoint).toBeNull();
    expect(mn.modes).toEqual([]);
    expect(mn.note).toMatch(/^No driving point: no reference DOF \(m3:\+X\) is also a response DOF/);
  });
});
