// The measurement engine's accumulators and snapshots, one import for callers.
export * from './active-level';
export * from './channel-meter';
export * from './howl';
export * from './levels';
export * from './meters';
export * from './segmental';
export * from './segments';
export * from './snapshot';
export * from './snr';
export * from './spectrum';
export * from './talker-meter';
export * from './weighting';
