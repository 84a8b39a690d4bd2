// Level scales. dBov is relative to the quantizer's overload point (a square wave at
// the overload point is 0 dBov); dBm0 is tied to dBov through the load capacity:
// a sine whose peak sits at the overload point has a power of +loadCapacity dBm0.

/** 10 log10(2): the crest of a sine in power terms. */
export const SINE_CREST_DB = 10 * Math.log10(2);

export function dbovFromRms(rms: number, overloadPoint: number): number {
  return 20 * Math.log10(rms / overloadPoint);
}

export function rmsFromDbov(dbov: number, overloadPoint: number): number {
  return overloadPoint * Math.pow(10, dbov / 20);
}

export function dbm0FromDbov(dbov: number, loadCapacityDbm0: number): number {
  return dbov + SINE_CREST_DB + loadCapacityDbm0;
}

export function dbovFromDbm0(dbm0: number, loadCapacityDbm0: number): number {
  return dbm0 - SINE_CREST_DB - loadCapacityDbm0;
}

/** Peak amplitude (float scale) of a sine at a level in dBm0 for a given quantizer. */
export function sineAmplitudeForDbm0(dbm0: number, overloadPoint: number, loadCapacityDbm0: number): number {
  return overloadPoint * Math.pow(10, (dbm0 - loadCapacityDbm0) / 20);
}

/** Float sample <-> 16-bit PCM: one factor, everywhere. */
export const PCM16_SCALE = 32768;
