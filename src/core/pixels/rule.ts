// Which multispectral pixels of a patch count as its own ("pure") for training.

export type PixelRule =
  /**
   * The pixel footprint lies wholly inside the patch shrunk inward by `buffer` metres
   * (default 0.5, a field GPS accuracy): a position error up to the buffer cannot move
   * the boundary into the pixel.
   */
  | { kind: 'inside'; buffer: number }
  /** The pixel centre lies inside the patch (what a plain rasterizer burns). */
  | { kind: 'centre' }
  /** At least `minCover` (0-1] of the footprint's area lies inside the patch. */
  | { kind: 'cover'; minCover: number };

export const DEFAULT_BUFFER_M = 0.5;
export const DEFAULT_MIN_COVER = 0.5;

/** A footprint short of full cover by less than this share still counts as wholly inside (rounding). */
export const FULL_COVER_TOLERANCE = 1e-9;

export const RULE_KINDS = ['inside', 'centre', 'cover'] as const;

/** Why a rule cannot be used, or null. */
export function ruleProblem(rule: PixelRule): string | null {
  if (rule.kind === 'inside' && !(Number.isFinite(rule.buffer) && rule.buffer >= 0)) {
    return `the buffer must be a distance of 0 m or more, got ${rule.buffer}`;
  }
  if (rule.kind === 'cover' && !(rule.minCover > 0 && rule.minCover <= 1)) {
    return `the least cover must be a share in (0, 1], got ${rule.minCover}`;
  }
  return null;
}

export function describeRule(rule: PixelRule): string {
  switch (rule.kind) {
    case 'inside':
      return rule.buffer > 0 ? `footprint wholly inside the patch shrunk by ${rule.buffer} m` : 'footprint wholly inside the patch';
    case 'centre':
      return 'pixel centre inside the patch';
    case 'cover':
      return `at least ${Math.round(rule.minCover * 1000) / 10} % of the footprint covered`;
  }
}
