import type { TileLayout } from './decodeTile.ts';
import type { TiffSummary } from './inspectTiff.ts';

// Finding the blocks (tiles or strips) of a summarised TIFF, and the layout decodeTile
// needs for each.

/** The index into level.offsets of the block holding (col, row) of a band (0-based). */
export function blockIndex(summary: TiffSummary, levelIndex: number, band: number, col: number, row: number): number {
  const level = summary.levels[levelIndex];
  const bx = Math.floor(col / level.blockWidth);
  const by = Math.floor(row / level.blockHeight);
  const perBand = level.blocksAcross * level.blocksDown;
  return (summary.planar === 2 ? band * perBand : 0) + by * level.blocksAcross + bx;
}

/** Which band (planar 2; else 0), block column and block row a block index is. */
export function blockPosition(summary: TiffSummary, levelIndex: number, index: number): { band: number; bx: number; by: number } {
  const level = summary.levels[levelIndex];
  const perBand = level.blocksAcross * level.blocksDown;
  const band = summary.planar === 2 ? Math.floor(index / perBand) : 0;
  const within = index - band * perBand;
  return { band, bx: within % level.blocksAcross, by: Math.floor(within / level.blocksAcross) };
}

/** The layout of one block; a strip at the bottom holds only the rows left. */
export function blockLayout(summary: TiffSummary, levelIndex: number, index: number): TileLayout {
  const level = summary.levels[levelIndex];
  const { band, by } = blockPosition(summary, levelIndex, index);
  const rows = level.tiled ? level.blockHeight : Math.min(level.blockHeight, level.height - by * level.blockHeight);
  const kind = level.tiled ? 'tile' : 'strip';
  return {
    width: level.blockWidth,
    height: rows,
    samples: summary.planar === 2 ? 1 : summary.bands,
    dtype: summary.dtype,
    compression: level.compression,
    predictor: level.predictor,
    littleEndian: summary.littleEndian,
    fileName: summary.fileName,
    blockName: `${kind} ${index} of ${levelIndex === 0 ? 'the full image' : `overview ${levelIndex}`}${summary.planar === 2 ? ` (band ${band + 1})` : ''}`,
  };
}
