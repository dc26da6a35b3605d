// Types for polylabel 2.1.0 (npm), which ships none: the pole of inaccessibility of a
// polygon (outer ring then holes) and its distance to the nearest edge.
declare module 'polylabel' {
  export default function polylabel(
    polygon: number[][][],
    precision?: number,
    debug?: boolean,
  ): number[] & { distance: number };
}
