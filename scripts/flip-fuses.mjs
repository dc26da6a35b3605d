#!/usr/bin/env node
// Packaging step: `node scripts/flip-fuses.mjs <path to the packaged Electron binary>`.
// Also usable as a packager's after-pack hook through the exported function.
import { tsImport } from 'tsx/esm/api';
import { pathToFileURL } from 'node:url';

const { flipPackagedFuses, getCurrentFuseWire } = await tsImport('../electron/fuses.ts', import.meta.url);

export async function flipFusesOf(binaryPath) {
  await flipPackagedFuses(binaryPath);
  return getCurrentFuseWire(binaryPath);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const target = process.argv[2];
  if (!target) {
    console.error('usage: node scripts/flip-fuses.mjs <path to the packaged Electron binary>');
    process.exit(2);
  }
  try {
    const wire = await flipFusesOf(target);
    console.log(`fuses set in ${target}: ${JSON.stringify(wire)}`);
  } catch (error) {
    console.error(`${target}: could not set the fuses (${error instanceof Error ? error.message : String(error)})`);
    process.exit(2);
  }
}
