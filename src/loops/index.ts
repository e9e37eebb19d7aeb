export type { LoopKind, ReferencePoint, LoopSpecification, LoopPlant, LoopContext, LoopDefinition } from './types.js';
export { LOOPS, LOOP_KINDS, findLoop } from './registry.js';
export { loopPlantFromLumped, loopPlantFromSingleTrack, previewFromCg_m } from './build.js';
export { lumpedYawRateTransferFunction } from './lumped-yaw-rate.js';
