// Acceptance masks for SNR-versus-level sweeps: a list of (dBm0, minimum dB) corner
// points joined by straight lines. Nothing is required outside the first and last
// corner. The mask is plain data so the user can edit it, the CLI can read it from
// text (`-45:24,-40:29,-30:35,0:35`) and sessions can store it.

export interface MaskPoint {
  /** Input level at the quantizer, dBm0. */
  dbm0: number;
  /** Least signal-to-total-distortion ratio required there, dB. */
  minDb: number;
}

export interface Mask {
  name: string;
  /** Corners, dBm0 strictly ascending. */
  points: MaskPoint[];
}

/**
 * ITU-T G.712 signal-to-total-distortion limits for the sine method (1020 Hz tone),
 * from memory: at least 35 dB from -30 to 0 dBm0, 29 dB at -40 dBm0, 24 dB at
 * -45 dBm0, straight lines between. G.712 judges the distortion at the channel output
 * within the voice band with the tone removed (from memory), so a sweep compares
 * this mask with its in-band figure, not with the wideband output - input error.
 * Nothing is required below -45 or above 0 dBm0: the limits there are not recalled
 * with confidence, so they are left for the user to add.
 */
export const G712_SINE_MASK: Mask = {
  name: 'G.712 sine method',
  points: [
    { dbm0: -45, minDb: 24 },
    { dbm0: -40, minDb: 29 },
    { dbm0: -30, minDb: 35 },
    { dbm0: 0, minDb: 35 },
  ],
};

export class MaskError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MaskError';
  }
}

/** Refuses masks that cannot be judged; the message names the bad corner. */
export function checkMask(mask: Mask): void {
  if (mask.points.length < 1) throw new MaskError(`mask "${mask.name}": needs at least one corner`);
  mask.points.forEach((p, i) => {
    if (!Number.isFinite(p.dbm0) || !Number.isFinite(p.minDb)) {
      throw new MaskError(`mask "${mask.name}": corner ${i + 1} is not a pair of finite numbers`);
    }
    if (i > 0 && !(p.dbm0 > mask.points[i - 1].dbm0)) {
      throw new MaskError(`mask "${mask.name}": corner ${i + 1} (${p.dbm0} dBm0) does not ascend`);
    }
  });
}

/** Required minimum at a level, or null where the mask says nothing. */
export function maskLimitAt(mask: Mask, dbm0: number): number | null {
  const p = mask.points;
  if (p.length === 0 || !(dbm0 >= p[0].dbm0) || !(dbm0 <= p[p.length - 1].dbm0)) return null;
  for (let i = 1; i < p.length; i++) {
    if (dbm0 <= p[i].dbm0) {
      const a = p[i - 1];
      const b = p[i];
      return a.minDb + ((b.minDb - a.minDb) * (dbm0 - a.dbm0)) / (b.dbm0 - a.dbm0);
    }
  }
  return p[0].minDb;
}

/** Judgement of one level point. */
export interface MaskVerdict {
  dbm0: number;
  /** Required minimum, null where the mask says nothing (then pass and margin are null too). */
  requiredDb: number | null;
  /** Measured minus required, dB. */
  marginDb: number | null;
  pass: boolean | null;
}

export interface MaskJudgement {
  mask: Mask;
  /** Which figure of the sweep the mask was held against. */
  figure: 'in-band' | 'wideband';
  verdicts: MaskVerdict[];
  /** Every judged point passes (and at least one was judged). */
  pass: boolean;
  judged: number;
  failed: number;
  /** The smallest margin and where it occurs, null when nothing was judged. */
  worstMarginDb: number | null;
  worstDbm0: number | null;
}

/** Holds measured figures (dB, one per level) against a mask. */
export function judgeAgainstMask(
  mask: Mask,
  levelsDbm0: readonly number[],
  measuredDb: readonly number[],
  figure: 'in-band' | 'wideband',
): MaskJudgement {
  checkMask(mask);
  if (levelsDbm0.length !== measuredDb.length) {
    throw new RangeError(`mask: ${levelsDbm0.length} levels but ${measuredDb.length} measured figures`);
  }
  const verdicts: MaskVerdict[] = [];
  let judged = 0;
  let failed = 0;
  let worstMarginDb: number | null = null;
  let worstDbm0: number | null = null;
  for (let i = 0; i < levelsDbm0.length; i++) {
    const dbm0 = levelsDbm0[i];
    const requiredDb = maskLimitAt(mask, dbm0);
    if (requiredDb === null) {
      verdicts.push({ dbm0, requiredDb, marginDb: null, pass: null });
      continue;
    }
    judged++;
    const marginDb = measuredDb[i] - requiredDb;
    const pass = marginDb >= 0;
    if (!pass) failed++;
    if (worstMarginDb === null || marginDb < worstMarginDb) {
      worstMarginDb = marginDb;
      worstDbm0 = dbm0;
    }
    verdicts.push({ dbm0, requiredDb, marginDb, pass });
  }
  return {
    mask,
    figure,
    verdicts,
    pass: judged > 0 && failed === 0,
    judged,
    failed,
    worstMarginDb,
    worstDbm0,
  };
}

/** Reads `DBM0:DB,DBM0:DB,...` (spaces allowed), as the command line and the mask editor write it. */
export function parseMask(text: string, name = 'custom'): Mask {
  const parts = text
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s !== '');
  const points = parts.map((part, i) => {
    const pair = part.split(':').map((s) => s.trim());
    const dbm0 = Number(pair[0]);
    const minDb = Number(pair[1]);
    if (
      pair.length !== 2 ||
      pair[0] === '' ||
      pair[1] === '' ||
      !Number.isFinite(dbm0) ||
      !Number.isFinite(minDb)
    ) {
      throw new MaskError(`mask corner ${i + 1} "${part}": expected DBM0:DB, for example -40:29`);
    }
    return { dbm0, minDb };
  });
  const mask = { name, points };
  checkMask(mask);
  return mask;
}

export function formatMask(mask: Mask): string {
  return mask.points.map((p) => `${p.dbm0}:${p.minDb}`).join(',');
}
