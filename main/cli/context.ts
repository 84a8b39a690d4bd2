// What every command gets: the process's I/O (injected, so tests drive commands in
// process), the version, the cores to use and the script workers start from.
import type { OptionSpec, ParsedArgs } from './args';
import type { StatusSink } from './progress';

export interface CliIo {
  out(line: string): void;
  err(line: string): void;
  /** The progress line, overwritten in place; given only when stderr is a terminal. */
  status?: StatusSink;
}

export interface CliEnv {
  /** Default for --jobs (the machine's cores). */
  cores?: number;
  /** Bundled script that can serve analysis tasks in a worker; null or absent: everything in this thread. */
  workerScript?: string | null;
}

export interface CliContext {
  io: CliIo;
  version: string;
  cores: number;
  workerScript: string | null;
}

export const EXIT_OK = 0;
export const EXIT_FAILURE = 1;
export const EXIT_USAGE = 2;

export interface Command {
  name: string;
  /** One line for the command list. */
  summary: string;
  /** The synopsis after `quantiscope NAME`, for example `FILE... [OPTIONS]`. */
  synopsis: string;
  /** Paragraphs of the help text after the synopsis. */
  description: string[];
  options: OptionSpec[];
  run(args: ParsedArgs, ctx: CliContext): Promise<number>;
}
