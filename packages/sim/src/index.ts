export { createRng, type Rng } from './rng.ts';
export { parseDof, dofLabel, type Axis, type ParsedDof } from './dof.ts';
export { compileModel, shapeVector, modeShapeValue, modelDofs, type Mode, type ModalModel, type CompiledModel } from './modal-model.ts';
export { modelFrf, type FrfKind, type ComplexArray } from './frf.ts';
export {
  freeFreeBeamRoots,
  freeFreeShape,
  freeFreeBeamModes,
  type BendingDirection,
  type FreeFreeBeamInput,
  type BeamMode,
  type FreeFreeBeam,
} from './free-free-beam.ts';
export type { GeometryPoint, DemoStructure } from './geometry.ts';
export { steelBar, steelBarModel, STEEL_BAR, STEEL_BAR_SUSPENSION, STEEL_BAR_ZETA, type SteelBarModelInput, type SteelBarSuspension } from './steel-bar.ts';
export { pumpSkidBaseplate, PUMP_SKID_PLATE, type PumpSkidOptions } from './pump-skid.ts';
export { simplySupportedPlate, SS_PLATE, type SsPlateOptions } from './ss-plate.ts';
export {
  halfSineForce,
  halfSineImpulse,
  halfSineSpectrum,
  sdofHalfSineResponse,
  addSdofHalfSineResponse,
  type HalfSinePulse,
  type SdofHalfSineInput,
} from './half-sine.ts';
export { digitise, digitiseInPlace, quantisationStep } from './adc.ts';
export { simulateHit, hitSeries, type HitOptions, type HitTruth, type SimulatedHit, type HitVariation } from './simulate-hit.ts';
export { toVolts, fromVolts } from './volts.ts';
