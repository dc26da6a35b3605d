import type { PatchTemplate } from './patchTemplate.ts';
import { latticePeak } from './bootstrap.ts';
import { combine, evaluateLattice, latticeNodes, type ShiftLattice } from './shiftLattice.ts';
import type { SignalGrid } from './signalGrid.ts';

// The baseline the coarse-to-fine search is measured against: every shift of the disc
// at the final lattice step, all patches, then the same quadratic peak fit.

export function bruteForceShift(templates: readonly PatchTemplate[], grid: SignalGrid, radius: number, step: number): [number, number] | null {
  const lattice: ShiftLattice = { cx: 0, cy: 0, step, half: Math.ceil(radius / step - 1e-9), radius };
  const perPatch = evaluateLattice(templates, grid, lattice);
  const peak = latticePeak(combine(perPatch, templates.length, latticeNodes(lattice), new Float64Array(templates.length).fill(1)), lattice);
  return peak ? peak.shift : null;
}
