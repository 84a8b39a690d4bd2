// The command line's logic, apart from process I/O so the tests can drive it.
// Every figure comes from core, the same functions the page and the worklet call.
import { channelFigures } from '../../core/spec/index';
import { optionHelp, parseArgs, UsageError } from './args';
import { analyzeCommand } from './commands/analyze';
import { channelCommand, presetsCommand } from './commands/channel';
import { compareCommand } from './commands/compare';
import { decodeCommand, encodeCommand } from './commands/encode';
import { designCommand } from './commands/design';
import { sweepCommand } from './commands/sweep';
import { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, type CliEnv, type CliIo, type Command } from './context';

export { channelFigures };
export { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, type CliEnv, type CliIo };

export const COMMANDS: readonly Command[] = [
  analyzeCommand,
  compareCommand,
  encodeCommand,
  decodeCommand,
  sweepCommand,
  designCommand,
  channelCommand,
  presetsCommand,
];

function usage(): string[] {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    'Usage: quantiscope COMMAND [OPTIONS]',
    '',
    'Commands:',
    ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    '  --help, -h     this text; `quantiscope COMMAND --help` for a command',
    '  --version      the version',
  ];
}

export function commandHelp(c: Command): string[] {
  return [
    `Usage: quantiscope ${c.name}${c.synopsis === '' ? '' : ` ${c.synopsis}`}`,
    '',
    `${c.summary[0].toUpperCase()}${c.summary.slice(1)}.`,
    ...(c.description.length > 0 ? ['', ...c.description] : []),
    '',
    'Options:',
    ...optionHelp(c.options),
  ];
}

/** Runs one command line; resolves to the exit status (never rejects). */
export async function runCli(
  argv: readonly string[],
  io: CliIo,
  version: string,
  env: CliEnv = {},
): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h') {
    usage().forEach((l) => io.out(l));
    return name === undefined ? EXIT_USAGE : EXIT_OK;
  }
  if (name === '--version') {
    io.out(version);
    return EXIT_OK;
  }
  if (name === 'help') {
    const c = COMMANDS.find((k) => k.name === rest[0]);
    (c === undefined ? usage() : commandHelp(c)).forEach((l) => io.out(l));
    return c === undefined && rest.length > 0 ? EXIT_USAGE : EXIT_OK;
  }
  const command = COMMANDS.find((c) => c.name === name);
  if (command === undefined) {
    io.err(`quantiscope: unknown command ${JSON.stringify(name)} (try --help)`);
    return EXIT_USAGE;
  }
  const ctx = { io, version, cores: Math.max(1, env.cores ?? 1), workerScript: env.workerScript ?? null };
  try {
    const args = parseArgs(rest, command.options);
    if (args.flags.has('help')) {
      commandHelp(command).forEach((l) => io.out(l));
      return EXIT_OK;
    }
    return await command.run(args, ctx);
  } catch (err) {
    if (err instanceof UsageError) {
      io.err(`quantiscope ${name}: ${err.message} (try quantiscope ${name} --help)`);
      return EXIT_USAGE;
    }
    // Anything else is reported as a sentence: a stack trace helps no one running a batch.
    // File errors carry the file's name in their message.
    io.err(`quantiscope ${name}: ${err instanceof Error ? err.message : String(err)}`);
    return EXIT_FAILURE;
  }
}
