export type RangeVerdict = { kind: 'none' } | { kind: 'unsatisfiable' } | { kind: 'range'; start: number; end: number };
export declare function parseRangeHeader(header: string | undefined, size: number): RangeVerdict;
