// Which DOF pairs a campaign measures, from its test type (design.md, "Plan"):
// roving hammer — the accelerometer(s) stay at the reference DOF(s) and the hammer visits every
// DOF (one row of the FRF matrix per reference); roving response — the hammer stays at the
// reference DOF(s) and the accelerometer visits every DOF (one column). Field-reference §9.
import { directions as directionOrder, sameAxis, type Direction, type TestType } from '@resonote/contracts';
import { labelCollator } from './geometry-csv.ts';

export interface PlanPoint {
  id: string;
  label: string;
  directions: Direction[];
}

export interface PlannedPair {
  responsePointId: string;
  responseDirection: Direction;
  excitationPointId: string;
  excitationDirection: Direction;
  drivingPoint: boolean;
}

export type PlanResult = { ok: true; pairs: PlannedPair[] } | { ok: false; message: string };

export function planSchedule(testType: TestType, referenceDofs: string[], points: PlanPoint[]): PlanResult {
  if (referenceDofs.length === 0) {
    return { ok: false, message: `Set the reference DOF(s) of the campaign first: where the ${testType === 'roving-hammer' ? 'accelerometer stays' : 'hammer strikes'}, for example B01:+Z.` };
  }
  const byLabel = new Map(points.map((p) => [p.label, p]));
  const refs: { point: PlanPoint; direction: Direction }[] = [];
  for (const dof of referenceDofs) {
    const [label, direction] = dof.split(':') as [string, Direction];
    const p = byLabel.get(label);
    if (!p) return { ok: false, message: `The reference DOF ${dof} names point ${label}, which is not in the geometry (or is retired).` };
    refs.push({ point: p, direction });
  }
  const ordered = [...points].sort((a, b) => labelCollator.compare(a.label, b.label));
  const roving = ordered.flatMap((p) => [...p.directions].sort((a, b) => directionOrder.indexOf(a) - directionOrder.indexOf(b)).map((direction) => ({ point: p, direction })));
  if (roving.length === 0) return { ok: false, message: 'No point has a measured direction yet: give the points their directions (±X, ±Y, ±Z) in the geometry.' };
  const pairs: PlannedPair[] = [];
  for (const r of roving) {
    for (const ref of refs) {
      const [response, excitation] = testType === 'roving-hammer' ? [ref, r] : [r, ref];
      pairs.push({
        responsePointId: response.point.id,
        responseDirection: response.direction,
        excitationPointId: excitation.point.id,
        excitationDirection: excitation.direction,
        // Same point and same axis, whatever the signs: P:−Z struck next to an accelerometer at P:+Z is
        // the driving point (contracts/axis.ts).
        drivingPoint: response.point.id === excitation.point.id && sameAxis(`p:${response.direction}`, `p:${excitation.direction}`),
      });
    }
  }
  return { ok: true, pairs };
}

export const pairKey = (p: { responsePointId: string; responseDirection: string; excitationPointId: string; excitationDirection: string }) =>
  `${p.responsePointId}|${p.responseDirection}|${p.excitationPointId}|${p.excitationDirection}`;
