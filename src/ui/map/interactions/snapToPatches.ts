import Snap from 'ol/interaction/Snap.js';
import type VectorSource from 'ol/source/Vector.js';

/** Pixels within which a drawn or dragged vertex jumps to a neighbouring patch's vertex or edge. */
export const SNAP_PIXELS = 10;

/**
 * Snaps vertices to the edges and corners of the stored patches, so neighbours share
 * their boundary instead of leaving a sliver gap or overlap. It must be added to the map
 * after the drawing and editing interactions (OpenLayers runs the last one first).
 */
export function snapToPatches(source: VectorSource): Snap {
  return new Snap({ source, pixelTolerance: SNAP_PIXELS, edge: true, vertex: true });
}
