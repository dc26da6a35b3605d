import type { AppFiles, AppFileInfo } from '../platform/types.ts';
import type { TileStore } from './tileStore.ts';

// Pyramid tiles kept on disk among the app's own files. A key is "<pyramid>/<tile>"; each
// pyramid (a group) is written as packs, one pack per put (the pyramid builder puts a
// row of tiles at a time), so a file holds many tiles and a write costs one atomic file
// replacement, not one per tile. A pack is ours:
//
//   bytes 0-3   the header's length H, unsigned 32-bit little-endian
//   bytes 4..   the header: UTF-8 JSON {"pyramid": "<group>", "tiles": [[name, offset, length], ...]}
//   then        the tiles' bytes; offsets count from the end of the header
//
// Files are named "tiles-<id>-<n>.pack", <id> a hash of the group's name (checked against
// the header on reading), <n> counting up; a later pack's tile wins over an earlier one's.
// "tiles-<id>.used" is rewritten when a group is first used in a session: its time says
// which pyramid was used least recently. When the packs of all groups would pass the cap,
// the least recently used groups (never one in use this session) are removed whole.
// A small cache in memory keeps the tiles last read or written (a coarser level is made
// from the tiles just written below it).

export interface DiskTileStoreOptions {
  /** The most bytes the packs of all pyramids may take. Default 2 GiB. */
  capBytes?: number;
  /** The most bytes of tiles kept in memory. Default 32 MiB. */
  memoryBytes?: number;
}

interface Place {
  pack: string;
  offset: number;
  length: number;
}

interface Group {
  id: string;
  places: Map<string, Place>;
  nextPack: number;
}

const PACK = /^tiles-([0-9a-f]{16})-(\d+)\.pack$/;
const USED = /^tiles-([0-9a-f]{16})\.used$/;
const HEAD_GUESS = 16 * 1024;

export class DiskTileStore implements TileStore {
  readonly #files: AppFiles;
  readonly #cap: number;
  readonly #memoryCap: number;
  readonly #groups = new Map<string, Promise<Group>>();
  readonly #memory = new Map<string, ArrayBuffer>();
  #memoryBytes = 0;

  constructor(files: AppFiles, options: DiskTileStoreOptions = {}) {
    this.#files = files;
    this.#cap = options.capBytes ?? 2 * 1024 ** 3;
    this.#memoryCap = options.memoryBytes ?? 32 * 1024 ** 2;
  }

  async get(key: string): Promise<ArrayBuffer | undefined> {
    const cached = this.#memory.get(key);
    if (cached) {
      this.#remember(key, cached);
      return cached;
    }
    const { group, name } = splitKey(key);
    const place = (await this.#group(group)).places.get(name);
    if (!place) return undefined;
    const bytes = await this.#files.read(place.pack, { offset: place.offset, length: place.length });
    if (!bytes || bytes.byteLength !== place.length) return undefined; // the pack was removed or cut: the tile is not there
    const tile = bytes.buffer.byteLength === bytes.byteLength ? (bytes.buffer as ArrayBuffer) : bytes.slice().buffer;
    this.#remember(key, tile);
    return tile;
  }

  async put(entries: [string, ArrayBuffer][]): Promise<void> {
    const byGroup = new Map<string, [string, ArrayBuffer][]>();
    for (const [key, value] of entries) {
      const { group, name } = splitKey(key);
      byGroup.set(group, [...(byGroup.get(group) ?? []), [name, value]]);
    }
    for (const [groupName, tiles] of byGroup) {
      const group = await this.#group(groupName);
      const { bytes, places } = packOf(groupName, tiles);
      if (group.places.size === 0 && group.nextPack === 0) await this.#makeRoom(bytes.byteLength, group.id);
      const pack = `tiles-${group.id}-${group.nextPack++}.pack`;
      await this.#files.write(pack, bytes);
      for (const [name, offset, length] of places) group.places.set(name, { pack, offset, length });
      for (const [name, value] of tiles) this.#remember(`${groupName}/${name}`, value);
    }
  }

  /** The group's index, read from its packs once per session (and its use noted). */
  #group(name: string): Promise<Group> {
    let found = this.#groups.get(name);
    if (!found) {
      found = this.#loadGroup(name);
      this.#groups.set(name, found);
      found.catch(() => this.#groups.delete(name));
    }
    return found;
  }

  async #loadGroup(name: string): Promise<Group> {
    const id = groupId(name);
    const packs = (await this.#files.list())
      .map((f) => ({ name: f.name, match: PACK.exec(f.name) }))
      .filter((f) => f.match?.[1] === id)
      .map((f) => ({ name: f.name, n: Number(f.match![2]) }))
      .sort((a, b) => a.n - b.n);
    const group: Group = { id, places: new Map(), nextPack: (packs.at(-1)?.n ?? -1) + 1 };
    for (const pack of packs) {
      const header = await this.#readHeader(pack.name);
      if (header?.pyramid !== name) continue; // damaged, or another pyramid of the same hash
      for (const [tile, offset, length] of header.tiles) group.places.set(tile, { pack: pack.name, offset: header.dataStart + offset, length });
    }
    await this.#files.write(`tiles-${id}.used`, new Date().toISOString()).catch(() => undefined);
    return group;
  }

  async #readHeader(pack: string): Promise<{ pyramid: string; tiles: [string, number, number][]; dataStart: number } | null> {
    try {
      let bytes = await this.#files.read(pack, { offset: 0, length: HEAD_GUESS });
      if (!bytes || bytes.byteLength < 4) return null;
      const length = new DataView(bytes.buffer, bytes.byteOffset, 4).getUint32(0, true);
      if (4 + length > bytes.byteLength) bytes = await this.#files.read(pack, { offset: 0, length: 4 + length });
      if (!bytes || bytes.byteLength < 4 + length) return null;
      const header = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + length)));
      return { pyramid: header.pyramid, tiles: header.tiles, dataStart: 4 + length };
    } catch {
      return null;
    }
  }

  /** Removes the least recently used pyramids (not those in use) until `incoming` more bytes fit under the cap. */
  async #makeRoom(incoming: number, keepId: string): Promise<void> {
    const inUse = new Set([keepId, ...[...this.#groups.keys()].map(groupId)]);
    const groups = new Map<string, { files: AppFileInfo[]; bytes: number; used: number }>();
    for (const file of await this.#files.list()) {
      const id = PACK.exec(file.name)?.[1] ?? USED.exec(file.name)?.[1];
      if (!id) continue;
      const entry = groups.get(id) ?? { files: [], bytes: 0, used: 0 };
      entry.files.push(file);
      if (PACK.test(file.name)) entry.bytes += file.size;
      entry.used = Math.max(entry.used, file.modified);
      groups.set(id, entry);
    }
    let total = [...groups.values()].reduce((sum, g) => sum + g.bytes, 0) + incoming;
    const oldestFirst = [...groups.entries()].filter(([id]) => !inUse.has(id)).sort((a, b) => a[1].used - b[1].used);
    for (const [, group] of oldestFirst) {
      if (total <= this.#cap) break;
      for (const file of group.files) await this.#files.remove(file.name);
      total -= group.bytes;
    }
  }

  #remember(key: string, tile: ArrayBuffer): void {
    if (this.#memory.delete(key)) this.#memoryBytes -= tile.byteLength;
    if (tile.byteLength > this.#memoryCap) return;
    this.#memory.set(key, tile);
    this.#memoryBytes += tile.byteLength;
    for (const [oldKey, old] of this.#memory) {
      if (this.#memoryBytes <= this.#memoryCap) break;
      this.#memory.delete(oldKey);
      this.#memoryBytes -= old.byteLength;
    }
  }
}

/** One pack of tiles: the bytes to write and where each tile sits among them (offsets after the header). */
export function packOf(pyramid: string, tiles: [string, ArrayBuffer][]): { bytes: Uint8Array; places: [string, number, number][] } {
  const places: [string, number, number][] = [];
  let offset = 0;
  for (const [name, value] of tiles) {
    places.push([name, offset, value.byteLength]);
    offset += value.byteLength;
  }
  const header = new TextEncoder().encode(JSON.stringify({ pyramid, tiles: places }));
  const bytes = new Uint8Array(4 + header.byteLength + offset);
  new DataView(bytes.buffer).setUint32(0, header.byteLength, true);
  bytes.set(header, 4);
  for (const [i, [, value]] of tiles.entries()) bytes.set(new Uint8Array(value), 4 + header.byteLength + places[i][1]);
  return { bytes, places: places.map(([name, at, length]) => [name, 4 + header.byteLength + at, length]) };
}

function splitKey(key: string): { group: string; name: string } {
  const cut = key.lastIndexOf('/');
  return cut < 0 ? { group: '', name: key } : { group: key.slice(0, cut), name: key.slice(cut + 1) };
}

/** 64 bits of FNV-1a (two 32-bit passes, forwards and backwards) as 16 hex digits: a name-safe id of a group. */
export function groupId(name: string): string {
  const fnv = (codes: number[]) => {
    let h = 0x811c9dc5;
    for (const c of codes) h = Math.imul(h ^ c, 0x01000193) >>> 0;
    return h.toString(16).padStart(8, '0');
  };
  const codes = [...new TextEncoder().encode(name)];
  return fnv(codes) + fnv(codes.reverse());
}
