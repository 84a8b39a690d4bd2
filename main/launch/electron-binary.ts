// Finding Electron's binary. Under Node, require('electron') returns the path of the
// binary the package downloaded at install time, or throws when it never did (as
// here: install scripts are off and there is no internet for the download).
import { accessSync, constants } from 'node:fs';

export type ElectronLookup = { found: true; path: string } | { found: false; reason: string };

export function findElectronBinary(
  load: () => unknown,
  isExecutable: (p: string) => boolean = executable,
): ElectronLookup {
  let value: unknown;
  try {
    value = load();
  } catch {
    return { found: false, reason: 'the electron package has no downloaded binary' };
  }
  if (typeof value !== 'string' || value === '') {
    return { found: false, reason: 'the electron package did not give a binary path' };
  }
  if (!isExecutable(value)) return { found: false, reason: `no executable at ${value}` };
  return { found: true, path: value };
}

function executable(p: string): boolean {
  try {
    accessSync(p, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}
