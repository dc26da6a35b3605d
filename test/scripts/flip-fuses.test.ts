// The packaging step as a command: flips the fuses of a generated file holding a fuse
// wire in the layout @electron/fuses 2.1.3 reads (see test/electron/fuses.test.ts),
// and fails with one clear line on a file that is not an Electron binary.
import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const run = promisify(execFile);
const script = path.resolve(import.meta.dirname, '../../scripts/flip-fuses.mjs');
let tmp: string;

beforeAll(async () => { tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-flip-')); });
afterAll(() => rm(tmp, { recursive: true, force: true }));

async function failure(args: string[]): Promise<{ code: number; stderr: string }> {
  try {
    await run(process.execPath, [script, ...args]);
  } catch (error) {
    const e = error as { code: number; stderr: string };
    return { code: e.code, stderr: e.stderr };
  }
  throw new Error('expected the command to fail');
}

describe('scripts/flip-fuses.mjs', () => {
  it('turns RunAsNode (fuse 0) and NODE_OPTIONS (fuse 2) off in the binary it is given', async () => {
    const binary = path.join(tmp, 'electron');
    await writeFile(binary, Buffer.concat([Buffer.from('dL7pKGdnNz796PbbjQWNKmHXBZaB9tsX'), Buffer.from([1, 9]), Buffer.from('111111111')]));
    const { stdout } = await run(process.execPath, [script, binary]);
    const wire = JSON.parse(stdout.slice(stdout.indexOf('{')));
    expect(wire['0']).toBe(0x30);
    expect(wire['2']).toBe(0x30);
  });

  it('says what is wrong, in one line, for a missing argument or a file without fuses', async () => {
    expect(await failure([])).toMatchObject({ code: 2, stderr: expect.stringMatching(/^usage: /) });
    const plain = path.join(tmp, 'not-electron');
    await writeFile(plain, 'just text');
    const result = await failure([plain]);
    expect(result.code).toBe(2);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toContain(`${plain}: could not set the fuses`);
  });
});
