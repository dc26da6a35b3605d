// The agreement core: what the agreement sheet and `fellfield agree` compute.
export type { Figure } from './figure.ts';
export type { PairedCall } from './pairedCall.ts';
export { confusionMatrix, matrixFromCounts, transpose, rowShares, columnShares, seenClasses, type ConfusionMatrix } from './confusionMatrix.ts';
export { cohenKappa, type CohenKappa } from './cohenKappa.ts';
export { pabak } from './pabak.ts';
export { specificAgreement, type ClassAgreement } from './specificAgreement.ts';
export { breakdownBy, type GroupAgreement } from './breakdown.ts';
export { fleissKappa, ratingTable, type FleissKappa } from './fleissKappa.ts';
export { maxWeightMatching, type WeightedEdge } from './hungarian.ts';
export { matchByIou, candidatePairs, flatbushCandidates, allPairsCandidates, type Outline, type MatchedPair, type IouMatching } from './iouMatch.ts';
export { delineationFigures, type DelineationFigures } from './delineation.ts';
export { explainKappa, explainSpecific, explainFleiss, explainDelineation } from './explanations.ts';
export { pairById, alignById, collidingIds, type CallOnPatch, type IdMismatch, type PairingResult, type AlignedCalls, type AlignmentResult } from './pairById.ts';
export { agreementSheet, type AgreementSheet, type SheetOptions } from './sheet.ts';
