// Calibration: the offset from the input's dBFS to dBm0, found with a tone of known
// level at the input and kept per input device. The browser shell keeps it in
// localStorage; the Electron shell will keep it through the bridge later.

const STORAGE_KEY = 'quantiscope.calibration.v1';

/** Level of a sine in dBFS from its RMS on the float scale: a full-scale sine reads 0 dBFS (AES17, from memory). */
export function dbfsFromRms(rms: number): number | null {
  return rms > 0 ? 20 * Math.log10(rms) + 10 * Math.log10(2) : null;
}

export interface CalibrationStore {
  get(device: string): number | null;
  set(device: string, offsetDb: number): void;
}

function readAll(storage: Storage | null): Record<string, number> {
  if (!storage) return {};
  try {
    const parsed: unknown = JSON.parse(storage.getItem(STORAGE_KEY) ?? '{}');
    if (typeof parsed !== 'object' || parsed === null) return {};
    const out: Record<string, number> = {};
    for (const [k, v] of Object.entries(parsed)) if (typeof v === 'number' && Number.isFinite(v)) out[k] = v;
    return out;
  } catch {
    return {};
  }
}

export function localCalibrationStore(
  storage: Storage | null = globalThis.localStorage ?? null,
): CalibrationStore {
  return {
    get: (device) => readAll(storage)[device] ?? null,
    set: (device, offsetDb) => {
      const all = readAll(storage);
      all[device] = offsetDb;
      try {
        storage?.setItem(STORAGE_KEY, JSON.stringify(all));
      } catch {
        // Storage full or refused: the offset still holds for this session.
      }
    },
  };
}
