import { parseArgs, type ParseArgsConfig } from 'node:util';
import { InputError } from './errors.ts';

/** What a verb writes: human text by default, one JSON document with --json. */
export interface VerbOutput {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
}

export interface Verb {
  name: string;
  /** One line for `fellfield --help`. */
  summary: string;
  /** The verb's own help text: usage line and options. */
  usage: string;
  /** Returns the exit code: 0 ok, 1 a finding the user asked to fail on, 2 bad input. */
  run(args: string[], out: VerbOutput): Promise<number>;
}

/** node:util parseArgs with errors turned into InputError (exit 2, one clear line). */
export function parseVerbArgs<T extends NonNullable<ParseArgsConfig['options']>>(
  verb: string,
  args: string[],
  options: T,
) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    throw new InputError(`${verb}: ${(error as Error).message}`);
  }
}
