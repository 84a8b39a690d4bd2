// The talker's active frames for the whole session, gathered from the engine's
// snapshots (channel A's frame trace) as they arrive.
import { FrameLevelTally } from '../../../core/design/frame-tally';
import type { FrameLevels } from '../../../core/design/index';
import type { AudioEngine } from '../../audio/engine';

export interface TalkerFrames {
  levels(): FrameLevels | null;
  readonly frames: number;
  destroy(): void;
}

export function watchTalkerFrames(engine: AudioEngine, onUpdate?: (frames: number) => void): TalkerFrames {
  const tally = new FrameLevelTally();
  let seen = -1;
  const take = (n: number) => {
    const a = engine.lastAnalysis;
    if (!a || n === seen) return;
    seen = n;
    const ch = a.channels[0].meter;
    tally.add(ch.segmental, ch.overloadPoint);
    onUpdate?.(tally.frames);
  };
  const off = engine.onChange((s) => take(s.snapshots));
  take(engine.state().snapshots);
  return {
    levels: () => tally.levels(),
    get frames() {
      return tally.frames;
    },
    destroy: off,
  };
}
