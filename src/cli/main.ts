import { Command, CommanderError, Option } from 'commander';
import { checkCommand } from './check.js';
import { EXIT_INPUT, EXIT_INTERNAL, EXIT_OK } from './exit.js';
import { CHECK_EXAMPLES, PROGRAM_EXAMPLES, RUN_EXAMPLES } from './help.js';
import { processIO, type CliIO } from './io.js';
import { FORMATS, parseSamplesOption, parseSpanOption, type Format } from './options.js';
import { runCommand } from './run.js';
import { packageVersion } from './version.js';

function buildProgram(io: CliIO, setCode: (code: number) => void): Command {
  const program = new Command();
  program
    .name('ringdown')
    .description('Exact transient responses of RC, RL and RLC circuits described in a plain-text circuit file.')
    .version(packageVersion(), '-V, --version', 'print the version')
    .helpOption('-h, --help', 'show this help')
    .addHelpText('after', PROGRAM_EXAMPLES)
    .exitOverride()
    .configureOutput({ writeOut: (s) => io.stdout.write(s), writeErr: (s) => io.stderr.write(s) })
    .showSuggestionAfterError(true);

  program
    .command('run')
    .description('compute the response and write a report')
    .argument('<file>', 'circuit file, or - to read standard input')
    .addOption(new Option('--format <format>', 'report format').choices(FORMATS).default('text'))
    .option('--out <file>', 'write the report to this file instead of standard output')
    .option('--plot <file.svg>', 'also write a figure of the watched signals as an SVG file')
    .option('--samples <n>', 'number of sample points (overrides the file)', parseSamplesOption)
    .option('--span <time>', 'length of the analysis, e.g. 2ms (overrides the file)', parseSpanOption)
    .option('--no-chart', 'leave the charts out of the text report')
    .option('--debug', 'print stack traces of internal errors')
    .addHelpText('after', RUN_EXAMPLES)
    .action(async (file: string, opts: { format: Format; out?: string; plot?: string; samples?: number; span?: number; chart: boolean; debug?: boolean }) => {
      setCode(await runCommand(file, opts, io));
    });

  program
    .command('check')
    .description('read and validate a circuit file and print it as ringdown understands it')
    .argument('<file>', 'circuit file, or - to read standard input')
    .option('--debug', 'print stack traces of internal errors')
    .addHelpText('after', CHECK_EXAMPLES)
    .action(async (file: string, opts: { debug?: boolean }) => {
      setCode(await checkCommand(file, opts, io));
    });

  return program;
}

/**
 * The ringdown command line. `argv` is process.argv (node, script, arguments...).
 * Returns the exit code: 0 ok, 1 internal error, 2 input errors, 3 cross-check failed,
 * 4 a rating exceeded after derating, 5 a danger caution; of 3, 5 and 4 the first that applies.
 */
export async function main(argv: string[], io: CliIO = processIO()): Promise<number> {
  let code = EXIT_OK;
  const program = buildProgram(io, (c) => (code = c));
  if (argv.length <= 2) {
    io.stderr.write(program.helpInformation());
    return EXIT_INPUT;
  }
  try {
    await program.parseAsync(argv, { from: 'node' });
    return code;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return EXIT_OK;
      if (e.code === 'commander.help') return e.exitCode === 0 ? EXIT_OK : EXIT_INPUT;
      return EXIT_INPUT; // usage problems: unknown option, bad value, missing file argument
    }
    const debug = argv.includes('--debug');
    io.stderr.write(`ringdown: internal error: ${e instanceof Error ? e.message : String(e)}\n`);
    if (debug && e instanceof Error && e.stack) io.stderr.write(e.stack + '\n');
    return EXIT_INTERNAL;
  }
}
