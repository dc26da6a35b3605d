/** One patch seen by two interpreters: their species calls and what the breakdowns group by. */
export interface PairedCall {
  /** The patch (or matched pair) this is about. */
  id: string;
  first: string;
  second: string;
  /** The first interpreter's confidence (sure / likely / unsure), when known. */
  confidence?: string;
  /** The species group of the first call (from the roster), when known. */
  group?: string;
}
