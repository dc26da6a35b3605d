// Fuses of a packaged build, flipped in the Electron binary itself after packaging
// (scripts/flip-fuses.mjs). Turning off RunAsNode and the NODE_OPTIONS variable stops
// the shipped binary from being used as a plain Node runtime or having code injected
// at start; the rest close other doors the app does not use.

import { FuseV1Options, FuseVersion, flipFuses, getCurrentFuseWire, type FuseV1Config } from '@electron/fuses';

export const PACKAGED_FUSES: FuseV1Config = {
  version: FuseVersion.V1,
  [FuseV1Options.RunAsNode]: false,
  [FuseV1Options.EnableNodeOptionsEnvironmentVariable]: false,
  [FuseV1Options.EnableNodeCliInspectArguments]: false,
  [FuseV1Options.EnableCookieEncryption]: true,
  [FuseV1Options.GrantFileProtocolExtraPrivileges]: false,
  // Asar integrity and asar-only loading need an asar archive; the packager that makes
  // one should switch these on too.
};

/** Flips the packaged fuses in the Electron binary at `binaryPath`; returns the bytes changed. */
export function flipPackagedFuses(binaryPath: string): Promise<number> {
  return flipFuses(binaryPath, PACKAGED_FUSES);
}

/** The current fuse wire of a binary, for checks after packaging. */
export { getCurrentFuseWire };
