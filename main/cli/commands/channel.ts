// quantiscope channel TEXT... and quantiscope presets: what a channel is and costs.
import {
  CHANNEL_PRESETS,
  CHANNEL_SYNTAX,
  channelFigures,
  parseChannel,
  type ChannelFigures,
} from '../../../core/spec/index';
import { UsageError, type ParsedArgs } from '../args';
import { EXIT_OK, type CliContext, type Command } from '../context';
import { exitStatus, HELP_OPTION, printLines, TABLE_OPTION, tablesOf } from './common';

function describe(f: ChannelFigures): string[] {
  const signed = (n: number) => (n >= 0 ? '+' : '') + n.toFixed(2);
  return [
    f.canonical,
    `  stages          ${f.stages.join(' > ')}`,
    `  bits            ${f.bits}`,
    `  rate            ${f.rateHz === null ? 'native' : `${f.rateHz} Hz`}`,
    `  bit rate        ${f.bitRate === null ? 'depends on the input rate' : `${f.bitRate / 1000} kbit/s`}`,
    `  overload point  ${f.overloadPoint.toFixed(5)} (${f.overloadPcm16.toFixed(0)} in 16-bit PCM)`,
    `  load capacity   ${signed(f.loadCapacityDbm0)} dBm0`,
    `  segments        ${f.segmentCount}`,
  ];
}

async function runChannel(args: ParsedArgs, ctx: CliContext): Promise<number> {
  const texts = args.operands;
  if (texts.length === 0)
    throw new UsageError('give at least one channel, for example: quantiscope channel g711-mu');
  const tables = await tablesOf(args);
  const figures: ChannelFigures[] = [];
  for (const text of texts) {
    try {
      figures.push(channelFigures(parseChannel(text, { tables })));
    } catch (err) {
      return exitStatus(ctx, 'channel', err instanceof Error ? err.message : String(err));
    }
  }
  if (args.flags.has('json')) ctx.io.out(JSON.stringify(figures));
  else figures.forEach((f) => printLines(ctx, describe(f)));
  return EXIT_OK;
}

export const channelCommand: Command = {
  name: 'channel',
  summary: 'describe channels given in the text form',
  synopsis: 'TEXT... [--table FILE]... [--json]',
  description: [
    `Channel text form: ${CHANNEL_SYNTAX}`,
    'table:NAME names a table of a --table file; the description gives it in full, every level.',
  ],
  options: [{ name: 'json', help: 'print one JSON array' }, TABLE_OPTION, HELP_OPTION],
  run: runChannel,
};

export const presetsCommand: Command = {
  name: 'presets',
  summary: 'list the channel presets',
  synopsis: '',
  description: [],
  options: [HELP_OPTION],
  run: async (args, ctx) => {
    if (args.operands.length > 0) throw new UsageError(`presets takes no operands (got ${args.operands[0]})`);
    for (const p of CHANNEL_PRESETS) ctx.io.out(`${p.text.padEnd(24)} ${p.title}`);
    return EXIT_OK;
  },
};
