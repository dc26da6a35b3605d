// The packaged-build fuses are flipped by @electron/fuses 2.1.3 (npm), the library
// Electron publishes for this. No Electron binary can be had here, so the test writes
// a small file holding a fuse wire in the layout that library reads: its sentinel
// string, a version byte, a length byte and one byte per fuse ('1' on, '0' off).
import { getCurrentFuseWire, FuseV1Options, FuseState } from '@electron/fuses';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flipPackagedFuses, PACKAGED_FUSES } from '../../electron/fuses.ts';

// The sentinel of Electron's fuse wire, as @electron/fuses 2.1.3 defines it (dist/constants.js).
const SENTINEL = 'dL7pKGdnNz796PbbjQWNKmHXBZaB9tsX';
const WIRE_LENGTH = 9;

let tmp: string;
let binary: string;

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-fuses-'));
  binary = path.join(tmp, 'electron');
  const wire = Buffer.concat([
    Buffer.from('\x7fELF fake executable body '.repeat(100)),
    Buffer.from(SENTINEL),
    Buffer.from([1, WIRE_LENGTH]),
    Buffer.from('1'.repeat(WIRE_LENGTH)), // every fuse on, as a fresh binary ships RunAsNode and NODE_OPTIONS
    Buffer.from(' trailing bytes'),
  ]);
  await writeFile(binary, wire);
});
afterAll(() => rm(tmp, { recursive: true, force: true }));

describe('packaged fuses', () => {
  it('turn off RunAsNode and the NODE_OPTIONS variable', async () => {
    const before = await getCurrentFuseWire(binary);
    expect(before[FuseV1Options.RunAsNode]).toBe(FuseState.ENABLE);
    await flipPackagedFuses(binary);
    const after = await getCurrentFuseWire(binary);
    expect(after[FuseV1Options.RunAsNode]).toBe(FuseState.DISABLE);
    expect(after[FuseV1Options.EnableNodeOptionsEnvironmentVariable]).toBe(FuseState.DISABLE);
    expect(after[FuseV1Options.EnableNodeCliInspectArguments]).toBe(FuseState.DISABLE);
    expect(after[FuseV1Options.GrantFileProtocolExtraPrivileges]).toBe(FuseState.DISABLE);
    expect(after[FuseV1Options.EnableCookieEncryption]).toBe(FuseState.ENABLE);
    // Fuses the config leaves alone keep their state.
    expect(after[FuseV1Options.WasmTrapHandlers]).toBe(FuseState.ENABLE);
  });

  it('change only the wire bytes of the binary', async () => {
    const bytes = await readFile(binary);
    const at = bytes.indexOf(SENTINEL) + SENTINEL.length + 2;
    expect(bytes.subarray(0, at - 2 - SENTINEL.length).toString()).toBe('\x7fELF fake executable body '.repeat(100));
    expect(bytes.subarray(at + WIRE_LENGTH).toString()).toBe(' trailing bytes');
  });

  it('name the two fuses the packaging rules require', () => {
    expect(PACKAGED_FUSES[FuseV1Options.RunAsNode]).toBe(false);
    expect(PACKAGED_FUSES[FuseV1Options.EnableNodeOptionsEnvironmentVariable]).toBe(false);
  });
});
