// The field-to-imagery shift module's public surface.
export {
  estimateShift, estimateFromTemplates, templatesFor, defaultSettings,
  type OffsetEstimate, type OffsetPatch, type OffsetPatchResult, type OffsetSettings, type ScoreSurface,
} from './estimateShift.ts';
export { sceneSignal, redAndNir, SceneSignalError, DEFAULT_SHADOW_SHARE, type SceneRaster } from './sceneSignal.ts';
export { ndviValues, brightnessValues, maskShadows, isConstant, type SignalGrid, type SignalKind } from './signalGrid.ts';
export { shiftPatches, shiftRecord, SHIFT_METHOD, type Shift, type ShiftRecord } from './shiftPatches.ts';
export { bruteForceShift } from './bruteForce.ts';
export { estimateByArea, type AreaShift, type AreaShifts } from './areaShifts.ts';
