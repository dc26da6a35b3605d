import type { LedgerEvent } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';

/** Re-applies the newest undone change, as a new ledger event; null when none. */
export function redo(ctx: SiteContext): Promise<LedgerEvent | null> {
  return ctx.store.redo(ctx.interpreter, ctx.now());
}
