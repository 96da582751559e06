// Modal parameter estimation: mode indicators, poly-reference LSCF stabilization diagram, frequency-domain
// residue fit with residual terms, FRF synthesis, window-damping correction, shape correlation.
export type { FrfSet, ModalFrf, ModalFrfKind, ComplexValue, PoleInput } from './types.ts';
export { cmif, sumFrf, type IndicatorCurves } from './cmif.ts';
export { stabilizationDiagram, type StabilizationOptions, type LscfWeighting } from './lscf.ts';
export {
  classifyPoles,
  pickStablePoles,
  DEFAULT_STABILITY_TOLERANCES,
  type Stability,
  type StabilityTolerances,
  type StabilizationDiagram,
  type DiagramPole,
  type PoleForStability,
} from './stability.ts';
export { suggestModes, type SuggestedMode, type SuggestOptions, type SuggestablePole } from './suggest.ts';
export { massNormalisedShapes, type MassNormalisedShapes, type MassNormalisedMode } from './mass-normalise.ts';
export { fitQuality, cmifPeaksWithoutColumn, type FitQuality, type CmifPeakCheckOptions } from './quality.ts';
export { clusterStablePoles, type ClusterablePole, type PoleCluster, type PoleClusterOptions } from './clusters.ts';
export { estimateShapes, type ShapeOptions, type ModalModel, type ModelMode } from './lsfd.ts';
export { synthesize } from './synthesize.ts';
export { correctWindowDamping } from './window-correction.ts';
export { macMatrix, mpc, realShape } from './shape-tools.ts';
export type { PoleValues } from './poles.ts';
