// One file through the measurement engine: the job `analyze` and `design` run for
// each file, in the main thread or in a worker (workers.ts) alike, so a parallel run
// gives the very figures of a serial one. Results are plain data (numbers, strings,
// arrays, null) that survive structured cloning and JSON unchanged.
//
// File-level figures (active level, activity, peak, overloads) are the talker
// statistics where the first channel meets the talker: at its rate, after the
// gain, in dBov of its first stage's overload point.
import { Analyzer, type AnalysisSnapshot } from '../../core/analysis/analyzer';
import { ChannelPath } from '../../core/channel/path';
import { FrameLevelTally } from '../../core/design/frame-tally';
import type { FrameLevels } from '../../core/design/recommend';
import { ActiveLevelMeter } from '../../core/measure/active-level';
import { emptySegmentalSnapshot } from '../../core/measure/segmental';
import { formatStage } from '../../core/spec/format';
import { parseChannel } from '../../core/spec/parse';
import type { ChannelSpec } from '../../core/spec/types';
import { finiteOrNull } from './format';
import { forEachBlock, INPUT_BLOCK, openInput, type Input, type InputOptions } from './input';
import { StageSnr } from './stage-meters';

export interface AnalyzeTask extends InputOptions {
  file: string;
  /** Channel text forms. */
  channels: string[];
  /** Bring the active level to this dBov first (null: no gain). */
  alignDbov: number | null;
  /** O.41 weighting of the error. */
  weighting?: boolean;
  /** Also return the talker's active frame levels at the first channel (for design). */
  collectLevels?: boolean;
}

export interface SegmentResult {
  index: number;
  /** Lower and upper edge, dBov (the lowest segment's lower edge is null: zero amplitude). */
  fromDbov: number | null;
  toDbov: number;
  /** Share of the channel's samples in the segment. */
  share: number;
  snrDb: number | null;
}

export interface StageResult {
  /** The stage added (its text form); snrDb is the figure after stages 1..s. */
  name: string;
  snrDb: number | null;
  /** SNR lost to this stage (the figure before it minus the figure after it); null for the first. */
  lossDb: number | null;
}

export interface ChannelResult {
  name: string;
  rate: number;
  bitRate: number;
  snrDb: number | null;
  weightedSnrDb?: number | null;
  segSnrDb: { mean: number | null; p5: number | null; p50: number | null; p95: number | null };
  segments: SegmentResult[];
  /** Samples beyond the first stage's overload point. */
  overloads: number;
  /** The talker where this channel meets it (its rate, dBov of its own overload point). */
  activeLevelDbov: number | null;
  activityFactor: number | null;
  peakDbov: number | null;
  /** SNR after each stage (one entry for a single-stage channel). */
  stages: StageResult[];
}

export interface FileResult {
  file: string;
  activeLevelDbov: number | null;
  activityFactor: number | null;
  peakDbov: number | null;
  overloads: number;
  channels: ChannelResult[];
  sampleRate: number;
  /** Rate the channel path ran at (the file's own unless it was converted). */
  pathRate: number;
  seconds: number;
  gainDb: number;
  /** The --align target, and the active level the first pass measured; null without --align. */
  alignedToDbov: number | null;
  measuredActiveLevelDbov: number | null;
  /** Peak of the file itself before any gain, dB re full scale. */
  inputPeakDbov: number | null;
}

/**
 * The talker's active frames at the first channel, as the page records them: the 20 ms
 * frames its segmental meter found above the silence floor, tallied by FrameLevelTally
 * (bin centres and counts, dB re the channel's overload point). Empty: no active frame.
 */
export interface LevelsResult {
  rate: number;
  overloadPoint: number;
  frames: Required<FrameLevels>;
}

/** Sums that combine over files (energies add; frame SNR means weight by their frames). */
export interface ChannelSums {
  samples: number;
  signalEnergy: number;
  errorEnergy: number;
  measuredFrames: number;
  segSnrMeanDb: number | null;
}

export interface AnalyzeOutcome {
  result: FileResult;
  /** Per channel, same order as result.channels. */
  sums: ChannelSums[];
  levels?: LevelsResult;
}

export type ProgressSink = (done: number, total: number) => void;

async function open(task: AnalyzeTask, specs: readonly ChannelSpec[]): Promise<Input> {
  return openInput(
    task.file,
    { track: task.track, raw: task.raw },
    specs.map((s) => s.rate),
  );
}

/** First pass of --align: the P.56 active level where the first channel meets the talker. */
async function measureActiveLevel(
  task: AnalyzeTask,
  spec: ChannelSpec,
  tick: (frames: number) => void,
): Promise<number | null> {
  const input = await open(task, [spec]);
  try {
    const path = new ChannelPath({
      inputRate: input.rate,
      channels: [spec],
      maxBlock: INPUT_BLOCK,
      listen: false,
    });
    const at = path.atRate[0];
    const meter = new ActiveLevelMeter({ rate: at.rateHz, overloadPoint: at.quantizers[0].overloadPoint });
    await forEachBlock(input, (block, n) => {
      path.process(block, n);
      meter.add(at.reference, 0, at.length);
      tick(input.position);
    });
    return meter.longTerm().activeLevelDbov;
  } finally {
    await input.close();
  }
}

function channelResult(
  snap: AnalysisSnapshot,
  i: number,
  spec: ChannelSpec,
  stageSnr: StageSnr | null,
  weighting: boolean,
): ChannelResult {
  const c = snap.channels[i];
  const m = c.meter;
  const seg = m.segments;
  const talker = snap.talkers[c.talker];
  // Talker levels are kept re the first channel at this rate; move them onto this one's overload point.
  const shift = 20 * Math.log10(talker.overloadPoint / m.overloadPoint);
  const moved = (db: number | null) => (db === null ? null : db + shift);
  const segments: SegmentResult[] = [];
  for (let s = 0; s < seg.counts.length; s++) {
    segments.push({
      index: s,
      fromDbov: finiteOrNull(seg.edgesDbov[s]),
      toDbov: seg.edgesDbov[s + 1],
      share: m.samples > 0 ? seg.counts[s] / m.samples : 0,
      snrDb: finiteOrNull(seg.snrDb[s]),
    });
  }
  const stages: StageResult[] = [];
  for (let s = 0; s < spec.stages.length; s++) {
    // The last stage's figure is the channel's own, so the two never disagree in the last digit.
    const snrDb = s === spec.stages.length - 1 || stageSnr === null ? m.snrDb : stageSnr.snrDb(s);
    const before = s === 0 ? null : stages[s - 1].snrDb;
    stages.push({
      name: formatStage(spec.stages[s]),
      snrDb,
      lossDb: before === null || snrDb === null ? null : before - snrDb,
    });
  }
  const out: ChannelResult = {
    name: c.text,
    rate: c.rate,
    bitRate: c.bitRate,
    snrDb: m.snrDb,
    segSnrDb: {
      mean: m.segmental.meanDb,
      p5: m.segmental.p5Db,
      p50: m.segmental.p50Db,
      p95: m.segmental.p95Db,
    },
    segments,
    overloads: m.overloads,
    activeLevelDbov: moved(talker.activeLongTerm.activeLevelDbov),
    activityFactor: talker.activeLongTerm.activityFactor,
    peakDbov: moved(talker.meter.peakDbov),
    stages,
  };
  if (weighting) out.weightedSnrDb = m.weightedSnrDb;
  return out;
}

export async function analyzeFile(task: AnalyzeTask, progress?: ProgressSink): Promise<AnalyzeOutcome> {
  if (task.channels.length === 0) throw new Error('no channel to analyse');
  const specs = task.channels.map((t) => parseChannel(t));
  const passes = task.alignDbov === null ? 1 : 2;
  let frames = 0;
  let done = 0;
  const tick = (position: number) => progress?.(done + position, frames * passes);

  let gainDb = 0;
  let measured: number | null = null;
  const input0 = await open(task, specs);
  frames = input0.info.frames;
  await input0.close();
  if (task.alignDbov !== null) {
    measured = await measureActiveLevel(task, specs[0], tick);
    if (measured === null) throw new Error('no active speech found, so --align has no level to set');
    gainDb = task.alignDbov - measured;
    done = frames;
  }

  const input = await open(task, specs);
  try {
    const analyzer = new Analyzer({
      inputRate: input.rate,
      channels: specs,
      maxBlock: INPUT_BLOCK,
      gainDb,
      listen: false,
      meter: { weighting: task.weighting === true },
    });
    const path = analyzer.path;
    const stageSnr = specs.map((s) => (s.stages.length > 1 ? new StageSnr(s.stages.length) : null));
    const first = path.atRate[0];
    // The very record the page keeps: the first channel's frame trace, read after each
    // block (a block holds far fewer frames than the trace's ring).
    const segmental = analyzer.meters[0].segmental;
    const tally = task.collectLevels === true ? new FrameLevelTally() : null;
    const trace = tally === null ? null : emptySegmentalSnapshot(segmental.traceFrames);
    const record = () => {
      if (tally === null || trace === null) return;
      const seen = trace.traceLastFrame;
      segmental.snapshot(trace);
      if (trace.traceLastFrame - seen > segmental.traceFrames)
        throw new Error('internal: frames left the trace before they were tallied');
      tally.add(trace, segmental.overloadPoint);
    };
    await forEachBlock(input, (block, n) => {
      analyzer.processBlock(block, n);
      for (let i = 0; i < specs.length; i++) {
        const meter = stageSnr[i];
        if (meter === null) continue;
        const at = path.atRate[i];
        meter.add(at.reference, at.stageOutputs, at.length);
      }
      record();
      tick(input.position);
    });
    analyzer.finish();
    record();
    const snap = analyzer.snapshot();
    const talker = snap.talkers[snap.channels[0].talker];
    const result: FileResult = {
      file: task.file,
      activeLevelDbov: talker.activeLongTerm.activeLevelDbov,
      activityFactor: talker.activeLongTerm.activityFactor,
      peakDbov: talker.meter.peakDbov,
      overloads: talker.meter.overloadCount,
      channels: specs.map((spec, i) => channelResult(snap, i, spec, stageSnr[i], task.weighting === true)),
      sampleRate: input.info.sampleRate,
      pathRate: input.rate,
      seconds: input.info.frames / input.info.sampleRate,
      gainDb,
      alignedToDbov: task.alignDbov,
      measuredActiveLevelDbov: measured,
      inputPeakDbov: snap.input.peakDbov,
    };
    const sums = snap.channels.map(({ meter: m }) => ({
      samples: m.samples,
      signalEnergy: m.signalPower * m.samples,
      errorEnergy: m.errorPower * m.samples,
      measuredFrames: m.segmental.measuredFrames,
      segSnrMeanDb: m.segmental.meanDb,
    }));
    const outcome: AnalyzeOutcome = { result, sums };
    if (tally !== null) {
      const got = tally.levels();
      outcome.levels = {
        rate: first.rateHz,
        overloadPoint: segmental.overloadPoint,
        frames: {
          levelsDbov: got?.levelsDbov ?? [],
          weights: got?.weights ?? [],
          overloadPoint: segmental.overloadPoint,
        },
      };
    }
    return outcome;
  } finally {
    await input.close();
  }
}
