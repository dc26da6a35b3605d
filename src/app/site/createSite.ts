import type { StoreOptions } from '../../store/SiteStore.ts';
import { SiteStore } from '../../store/SiteStore.ts';
import { crsUnits } from '../../core/crs.ts';
import { newId, type SiteContext } from './context.ts';
import { openPassFor } from './openPassFor.ts';

export interface CreateSiteInput {
  name: string;
  /** the scene's projected CRS, in metres */
  epsg: number;
  interpreter: string;
  now(): string;
  id?: string;
}

/** Creates a site with its first ledger event and an open pass for its creator. */
export async function createSite(input: CreateSiteInput, options: StoreOptions = {}): Promise<SiteContext> {
  const name = input.name.trim();
  if (!name) throw new Error('a site needs a name');
  if (crsUnits(input.epsg) !== 'metre') throw new Error(`EPSG:${input.epsg} is not a projected CRS in metres; patches are kept in the scene's CRS`);
  const store = await SiteStore.create({ id: input.id ?? newId('site'), name, epsg: input.epsg, createdAt: input.now() }, input.interpreter, options);
  const context = { store, interpreter: input.interpreter, now: input.now };
  await openPassFor(context);
  return context;
}
