// Printing the channel text form. Defaults are left out, so equal channels print
// equally and parse(format(spec)) gives the spec back.
import { DEFAULT_RATE, type ChannelRate, type ChannelSpec, type StageOptions, type StageSpec } from './types';

function num(n: number): string {
  return String(n);
}

function options(o: StageOptions): string {
  let s = '';
  if (o.segments !== undefined) s += `,seg=${o.segments}`;
  if (o.overloadPoint !== undefined) s += `,ov=${num(o.overloadPoint)}`;
  if (o.loadCapacityDbm0 !== undefined) s += `,lc=${num(o.loadCapacityDbm0)}`;
  return s;
}

export function formatStage(stage: StageSpec): string {
  switch (stage.law) {
    case 'g711-mu':
      return stage.zeroSuppression ? 'g711-mu,zs' : 'g711-mu';
    case 'g711-a':
      return 'g711-a';
    case 'uniform':
      return `uniform:${stage.bits}${stage.form === 'rise' ? ':rise' : ''}${options(stage)}`;
    case 'mu':
      return `mu:${num(stage.mu)}:${stage.bits}${options(stage)}`;
    case 'a':
      return `a:${num(stage.a)}:${stage.bits}${options(stage)}`;
    case 'table': {
      const name = stage.name ? `${stage.name}:` : '';
      return `table:${name}${stage.decisions.map(num).join('/')}:${stage.outputs.map(num).join('/')}${options(stage)}`;
    }
  }
}

export function formatRate(rate: ChannelRate): string {
  if (rate === 'native') return 'native';
  return rate % 1000 === 0 ? `${rate / 1000}k` : String(rate);
}

export function formatChannel(spec: ChannelSpec): string {
  const stages = spec.stages.map(formatStage).join('>');
  return spec.rate === DEFAULT_RATE ? stages : `${stages}@${formatRate(spec.rate)}`;
}
