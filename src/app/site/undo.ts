import type { LedgerEvent } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';

/** Reverses the newest change still on the undo stack, as a new ledger event; null when none. */
export function undo(ctx: SiteContext): Promise<LedgerEvent | null> {
  return ctx.store.undo(ctx.interpreter, ctx.now());
}
