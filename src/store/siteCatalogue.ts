import Dexie, { type Table } from 'dexie';
import type { Site } from '../core/site/index.ts';

// The list of sites on this machine, for the start screen: one small database apart from
// the sites' own, so listing never opens a site.

export interface SiteListing {
  id: string;
  name: string;
  epsg: number;
  createdAt: string;
}

class CatalogueDatabase extends Dexie {
  sites!: Table<SiteListing, string>;
  constructor(options: { indexedDB?: IDBFactory; IDBKeyRange?: typeof IDBKeyRange }) {
    super('fellfield-sites', { chromeTransactionDurability: 'strict', ...options });
    this.version(1).stores({ sites: '&id, name' });
  }
}

async function withCatalogue<T>(options: { indexedDB?: IDBFactory }, work: (db: CatalogueDatabase) => Promise<T>): Promise<T> {
  const db = new CatalogueDatabase(options);
  try {
    return await work(db);
  } finally {
    db.close();
  }
}

export function rememberSite(site: Site, options: { indexedDB?: IDBFactory } = {}): Promise<void> {
  return withCatalogue(options, async (db) => {
    await db.sites.put({ id: site.id, name: site.name, epsg: site.epsg, createdAt: site.createdAt });
  });
}

export function forgetSite(siteId: string, options: { indexedDB?: IDBFactory } = {}): Promise<void> {
  return withCatalogue(options, (db) => db.sites.delete(siteId));
}

/** Sites on this machine, by name. */
export function listSites(options: { indexedDB?: IDBFactory } = {}): Promise<SiteListing[]> {
  return withCatalogue(options, (db) => db.sites.orderBy('name').toArray());
}
