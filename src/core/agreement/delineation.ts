import { defined, undefinedBecause, type Figure } from './figure.ts';
import type { IouMatching } from './iouMatch.ts';

export interface DelineationFigures {
  minIou: number;
  firstCount: number;
  secondCount: number;
  matched: number;
  unmatchedFirst: number;
  unmatchedSecond: number;
  /** Mean IoU over the matched pairs. */
  meanIou: Figure;
  /**
   * Of the area shared by matched pairs, the share on which both gave the same species:
   * agreement weighted by area, so a large patch counts more than a sliver.
   */
  areaWeightedAgreement: Figure;
  /** Share of each delineation's area that lies in matched outlines. */
  matchedAreaShareFirst: Figure;
  matchedAreaShareSecond: Figure;
}

function share(part: number, whole: number, reason: string): Figure {
  return whole > 0 ? defined(part / whole) : undefinedBecause(reason);
}

/** The delineation figures of a matching; species[i] is the call on outline i of each side. */
export function delineationFigures(
  matching: IouMatching,
  firstSpecies: readonly string[],
  secondSpecies: readonly string[],
): DelineationFigures {
  const { pairs } = matching;
  let iouSum = 0;
  let sharedArea = 0;
  let sameSpeciesArea = 0;
  let matchedFirstArea = 0;
  let matchedSecondArea = 0;
  for (const p of pairs) {
    iouSum += p.iou;
    sharedArea += p.intersection;
    if (firstSpecies[p.first] === secondSpecies[p.second]) sameSpeciesArea += p.intersection;
    matchedFirstArea += matching.firstAreas[p.first];
    matchedSecondArea += matching.secondAreas[p.second];
  }
  const totalFirst = matching.firstAreas.reduce((s, a) => s + a, 0);
  const totalSecond = matching.secondAreas.reduce((s, a) => s + a, 0);
  const none = `no pair of outlines reached IoU ${matching.minIou}`;
  return {
    minIou: matching.minIou,
    firstCount: matching.firstAreas.length,
    secondCount: matching.secondAreas.length,
    matched: pairs.length,
    unmatchedFirst: matching.unmatchedFirst.length,
    unmatchedSecond: matching.unmatchedSecond.length,
    meanIou: pairs.length ? defined(iouSum / pairs.length) : undefinedBecause(none),
    areaWeightedAgreement: pairs.length ? share(sameSpeciesArea, sharedArea, none) : undefinedBecause(none),
    matchedAreaShareFirst: share(matchedFirstArea, totalFirst, 'the first delineation has no area'),
    matchedAreaShareSecond: share(matchedSecondArea, totalSecond, 'the second delineation has no area'),
  };
}
