// The command line's logic, apart from process I/O so the tests can drive it.
// Every figure comes from core, the same functions the page and the worklet call.
import { CHANNEL_PRESETS, CHANNEL_SYNTAX, channelFigures, type ChannelFigures } from '../../core/spec/index';

export { channelFigures };

export interface CliIo {
  out(line: string): void;
  err(line: string): void;
}

export const EXIT_OK = 0;
export const EXIT_FAILURE = 1;
export const EXIT_USAGE = 2;

const USAGE = [
  'Usage: quantiscope COMMAND [OPTIONS]',
  '',
  'Commands:',
  '  channel TEXT...   describe channels given in the text form (--json for one JSON array)',
  '  presets           list the channel presets',
  '  --help            this text',
  '  --version         the version',
  '',
  `Channel text form: ${CHANNEL_SYNTAX}`,
];

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

export function runCli(argv: readonly string[], io: CliIo, version: string): number {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    USAGE.forEach((l) => io.out(l));
    return command === undefined ? EXIT_USAGE : EXIT_OK;
  }
  if (command === '--version') {
    io.out(version);
    return EXIT_OK;
  }
  if (command === 'presets') {
    for (const p of CHANNEL_PRESETS) io.out(`${p.text.padEnd(24)} ${p.title}`);
    return EXIT_OK;
  }
  if (command === 'channel') {
    const json = rest.includes('--json');
    const texts = rest.filter((a) => a !== '--json');
    const unknown = texts.find((t) => t.startsWith('--'));
    if (unknown) {
      io.err(`quantiscope channel: unknown option ${unknown}`);
      return EXIT_USAGE;
    }
    if (texts.length === 0) {
      io.err('quantiscope channel: give at least one channel, for example: quantiscope channel g711-mu');
      return EXIT_USAGE;
    }
    const figures: ChannelFigures[] = [];
    for (const text of texts) {
      try {
        figures.push(channelFigures(text));
      } catch (err) {
        io.err(`quantiscope channel: ${err instanceof Error ? err.message : String(err)}`);
        return EXIT_FAILURE;
      }
    }
    if (json) io.out(JSON.stringify(figures));
    else figures.forEach((f) => describe(f).forEach((l) => io.out(l)));
    return EXIT_OK;
  }
  io.err(`quantiscope: unknown command ${JSON.stringify(command)} (try --help)`);
  return EXIT_USAGE;
}
