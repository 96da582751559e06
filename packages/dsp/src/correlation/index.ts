// Test ↔ model correlation and pre-test planning: Effective Independence, a driving-point measure,
// auto-MAC, MAC pairing with frequency differences, cross-orthogonality (mass matrix or SEREP).
export type { RealShapes } from './shapes.ts';
export {
  effectiveIndependence,
  type EffectiveIndependence,
  type EffectiveIndependenceOptions,
  type EffectiveIndependenceStep,
} from './effective-independence.ts';
export { drivingPointMeasure, type DrivingPointMeasure } from './driving-point.ts';
export {
  autoMac,
  macPairs,
  type AutoMac,
  type AutoMacOptions,
  type CorrelationMode,
  type MacPairOptions,
  type MacPairs,
  type ModePair,
} from './mac-pairing.ts';
export { crossOrthogonality, type CrossOrthogonality } from './cross-orthogonality.ts';
