import { describe, expect, it } from 'vitest';
import { helpText, main } from '../../src/cli/main.ts';

async function cli(...args: string[]) {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const code = await main(args, { stdout: (t) => stdout.push(t), stderr: (t) => stderr.push(t) });
  return { code, stdout: stdout.join('\n'), stderr: stderr.join('\n') };
}

describe('fellfield dispatch', () => {
  it('--help lists every verb with its summary and says the exit codes', async () => {
    const { code, stdout } = await cli('--help');
    expect(code).toBe(0);
    expect(stdout).toBe(helpText());
    expect(stdout).toMatch(/^fellfield <verb> \[files\] \[options\]/);
    expect(stdout).toMatch(/^ {2}info +describe a GeoTIFF: size, bands, data type, CRS, extent, tiling, compression, overviews$/m);
    expect(stdout).toMatch(/Exit codes: 0 success, 1 findings you asked to fail on \(--fail-on\), 2 bad input\./);
    expect((await cli('-h')).stdout).toBe(stdout);
    expect((await cli('help')).stdout).toBe(stdout);
  });

  it('no verb prints the help and exits 2', async () => {
    const { code, stdout } = await cli();
    expect(code).toBe(2);
    expect(stdout).toBe(helpText());
  });

  it('an unknown verb is one line and exit 2', async () => {
    const { code, stdout, stderr } = await cli('colour', 'x.tif');
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toBe("fellfield: unknown verb 'colour'. Run `fellfield --help` for the list.");
  });

  it('a verb\'s --help prints its usage and exits 0', async () => {
    const { code, stdout } = await cli('info', '--help');
    expect(code).toBe(0);
    expect(stdout).toMatch(/^fellfield info FILE\.tif \[--json\]/);
    expect(stdout).toMatch(/Bad input \(exit 2/);
    expect(stdout).toMatch(/Warnings \(exit 0/);
  });
});
