import { InputError } from './errors.ts';
import type { VerbOutput } from './verb.ts';
import { verbs } from './verbs/index.ts';

const defaultOutput: VerbOutput = {
  stdout: (text) => process.stdout.write(text.endsWith('\n') ? text : `${text}\n`),
  stderr: (text) => process.stderr.write(text.endsWith('\n') ? text : `${text}\n`),
};

export function helpText(): string {
  const width = Math.max(...verbs.map((v) => v.name.length), 4);
  const lines = verbs.map((v) => `  ${v.name.padEnd(width)}  ${v.summary}`);
  return [
    'fellfield <verb> [files] [options]',
    '',
    'Headless tools over the same core as the Fellfield app.',
    'Every verb prints text by default and one JSON document with --json.',
    'Exit codes: 0 success, 1 findings you asked to fail on (--fail-on), 2 bad input.',
    '',
    'Verbs:',
    ...lines,
    '',
    'Run `fellfield <verb> --help` for a verb\'s options.',
  ].join('\n');
}

/** Runs the CLI; returns the exit code instead of exiting, so tests can call it. */
export async function main(argv: string[], out: VerbOutput = defaultOutput): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    out.stdout(helpText());
    return name ? 0 : 2;
  }
  const verb = verbs.find((v) => v.name === name);
  if (!verb) {
    out.stderr(`fellfield: unknown verb '${name}'. Run \`fellfield --help\` for the list.`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    out.stdout(verb.usage);
    return 0;
  }
  try {
    return await verb.run(rest, out);
  } catch (error) {
    if (error instanceof InputError) {
      out.stderr(`fellfield ${verb.name}: ${error.message}`);
      return 2;
    }
    // Anything else is our bug, still told in one line rather than a stack trace.
    out.stderr(`fellfield ${verb.name}: internal error: ${(error as Error)?.message ?? String(error)}`);
    return 2;
  }
}
