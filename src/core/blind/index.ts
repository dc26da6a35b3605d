// Blind passes: choosing patches for a second look, the shuffled order, what a blind
// view may show, the package and answers files, and comparing passes.
export { BLIND_ANSWERS, CANT_TELL, isBlindCall, namesNoSpecies, type BlindAnswer as BlindAnswerClass } from './answers.ts';
export { BlindError } from './BlindError.ts';
export { referenceCalls } from './referenceCall.ts';
export { proportionalAllocation, stratifiedSample, type Stratum, type StratumDraw, type StratifiedSample } from './stratifiedSample.ts';
export { selectPatches, type PatchSelection, type SelectedPatches } from './selection.ts';
export { shuffledOrder } from './shuffledOrder.ts';
export { blindView, openBlindPassOf, isDelineationPass, drawnIn, patchesOfPass } from './blindView.ts';
export {
  BLIND_PACKAGE_FORMAT, BLIND_PACKAGE_VERSION, buildBlindPackage, writeBlindPackage, readBlindPackage, packageContentOf, contentHashOf,
  type BlindPackage, type PackageContent, type PackagePatch,
} from './blindPackage.ts';
export {
  BLIND_ANSWERS_FORMAT, BLIND_ANSWERS_VERSION, buildBlindAnswers, writeBlindAnswers, readBlindAnswers, fitAnswers,
  type BlindAnswers, type BlindAnswer, type AnswersFit,
} from './blindAnswers.ts';
export { pairPasses, passSheet, passesFleiss, delineationSheet, classOrder, type PassSheet, type PassesFleiss, type DelineationSheet } from './passComparison.ts';
export { agreementCsv, type SheetCsvInput } from './sheetCsv.ts';
export { agreementReport, type ReportLine } from './sheetText.ts';
export { imagePdf, jpegSize } from './imagePdf.ts';
