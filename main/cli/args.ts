// Command-line options in the usual GNU style: `--name value`, `--name=value`,
// `-x value`, `-xvalue`, bundled short flags (`-hj2` is -h -j 2), `--` ends the
// options, and options may come before, between or after the operands. An option
// that takes a value takes the next word whatever it looks like, so `--align -26`
// works as getopt does it.

export interface OptionSpec {
  /** Long name without the dashes. */
  name: string;
  /** One-letter alias. */
  short?: string;
  /** Name of the value in the help (absent: the option is a flag). */
  value?: string;
  /** May be given more than once (values collect in order). */
  repeat?: boolean;
  help: string;
}

export interface ParsedArgs {
  /** Values of value options, in the order given. */
  values: Map<string, string[]>;
  flags: Set<string>;
  operands: string[];
}

/** A mistake in how the command was called: exit status 2 with a hint. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

export function parseArgs(argv: readonly string[], specs: readonly OptionSpec[]): ParsedArgs {
  const values = new Map<string, string[]>();
  const flags = new Set<string>();
  const operands: string[] = [];
  const byLong = new Map(specs.map((s) => [s.name, s]));
  const byShort = new Map(specs.filter((s) => s.short !== undefined).map((s) => [s.short as string, s]));

  const give = (spec: OptionSpec, shown: string, value: string | undefined): void => {
    if (spec.value === undefined) {
      if (value !== undefined) throw new UsageError(`option ${shown} takes no value`);
      flags.add(spec.name);
      return;
    }
    if (value === undefined) throw new UsageError(`option ${shown} needs a value (${spec.value})`);
    const list = values.get(spec.name) ?? [];
    if (list.length > 0 && spec.repeat !== true) throw new UsageError(`option ${shown} is given twice`);
    list.push(value);
    values.set(spec.name, list);
  };

  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--') {
      operands.push(...argv.slice(i + 1));
      break;
    }
    if (a.startsWith('--')) {
      const eq = a.indexOf('=');
      const name = eq < 0 ? a.slice(2) : a.slice(2, eq);
      const spec = byLong.get(name);
      if (spec === undefined) throw new UsageError(`unknown option --${name}`);
      if (eq >= 0) give(spec, `--${name}`, a.slice(eq + 1));
      else if (spec.value !== undefined) {
        if (i + 1 >= argv.length) throw new UsageError(`option --${name} needs a value (${spec.value})`);
        give(spec, `--${name}`, argv[++i]);
      } else give(spec, `--${name}`, undefined);
      continue;
    }
    // A lone '-' is an operand (by convention standard input; refused later as a file).
    if (a.startsWith('-') && a.length > 1) {
      for (let k = 1; k < a.length; k++) {
        const letter = a[k];
        const spec = byShort.get(letter);
        if (spec === undefined) throw new UsageError(`unknown option -${letter}`);
        if (spec.value === undefined) {
          give(spec, `-${letter}`, undefined);
          continue;
        }
        const rest = a.slice(k + 1);
        if (rest !== '') give(spec, `-${letter}`, rest);
        else {
          if (i + 1 >= argv.length) throw new UsageError(`option -${letter} needs a value (${spec.value})`);
          give(spec, `-${letter}`, argv[++i]);
        }
        break;
      }
      continue;
    }
    operands.push(a);
  }
  return { values, flags, operands };
}

/** The last value of an option, or undefined. */
export function valueOf(args: ParsedArgs, name: string): string | undefined {
  const list = args.values.get(name);
  return list === undefined ? undefined : list[list.length - 1];
}

export function valuesOf(args: ParsedArgs, name: string): string[] {
  return args.values.get(name) ?? [];
}

export interface NumberRule {
  min?: number;
  max?: number;
  integer?: boolean;
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)(e[+-]?\d+)?$/i;

/** A number option checked against its rule; the message names the option. */
export function numberOption(name: string, text: string, rule: NumberRule = {}): number {
  const n = Number(text);
  if (!NUMBER.test(text.trim()) || !Number.isFinite(n))
    throw new UsageError(`--${name} needs a number (got "${text}")`);
  if (rule.integer === true && !Number.isInteger(n))
    throw new UsageError(`--${name} needs a whole number (got ${text})`);
  if (rule.min !== undefined && n < rule.min)
    throw new UsageError(`--${name} must be at least ${rule.min} (got ${text})`);
  if (rule.max !== undefined && n > rule.max)
    throw new UsageError(`--${name} must be at most ${rule.max} (got ${text})`);
  return n;
}

/** One of a few words; the message lists them. */
export function choiceOption<T extends string>(name: string, text: string, choices: readonly T[]): T {
  const found = choices.find((c) => c === text);
  if (found === undefined)
    throw new UsageError(`--${name} must be one of ${choices.join(', ')} (got "${text}")`);
  return found;
}

/** The options block of a help text. */
export function optionHelp(specs: readonly OptionSpec[]): string[] {
  const heads = specs.map((s) => {
    const long = `--${s.name}${s.value === undefined ? '' : ` ${s.value}`}`;
    return s.short === undefined ? `    ${long}` : `-${s.short}, ${long}`;
  });
  const width = Math.max(...heads.map((h) => h.length));
  return specs.map(
    (s, i) => `  ${heads[i].padEnd(width)}  ${s.help}${s.repeat === true ? ' (repeatable)' : ''}`,
  );
}
