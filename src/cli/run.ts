import { writeFile } from 'node:fs/promises';
import { type AnalyzeOptions, analyzeText } from '../pipeline.js';
import { colorEnabled } from '../report/color.js';
import { formatCSV } from '../report/csv.js';
import { runCautions } from '../measure/cautions.js';
import { runRatings } from '../measure/ratings.js';
import { formatJSON } from '../report/json.js';
import { formatNumbers } from '../report/numbers.js';
import { formatSI } from '../units/si.js';
import { renderSVG } from '../report/svg.js';
import { RATING_NAMES } from '../report/stress.js';
import { formatTextReport } from '../report/text.js';
import type { RunResult } from '../simulate/result.js';
import { EXIT_CROSS_CHECK, EXIT_DANGER, EXIT_INPUT, EXIT_OK, EXIT_RATING, exitPriority } from './exit.js';
import { printWarnings, reportFailure } from './failure.js';
import { readCircuitText } from './input.js';
import type { CliIO } from './io.js';
import type { Format } from './options.js';

export interface RunOptions {
  format: Format;
  out?: string;
  /** also write the SVG figure to this file */
  plot?: string;
  samples?: number;
  span?: number;
  chart: boolean;
  debug?: boolean;
}

function render(result: RunResult, opts: RunOptions, color: boolean): string {
  switch (opts.format) {
    case 'json':
      return formatJSON(result);
    case 'csv':
      return formatCSV(result);
    case 'numbers':
      return formatNumbers(result);
    case 'text':
      return formatTextReport(result, { chart: opts.chart, color });
  }
}

/** Exit code 5, with one line per caution on standard error, when a danger caution fires. */
function dangerExit(result: RunResult, io: CliIO): number {
  const danger = runCautions(result).filter((c) => c.severity === 'danger');
  for (const c of danger) io.stderr.write(`ringdown: DANGER: ${c.title}${c.parts && c.parts.length > 0 ? ` (${c.parts.join(', ')})` : ''}\n`);
  return danger.length > 0 ? EXIT_DANGER : EXIT_OK;
}

/** Exit code 4, with one line per check on standard error, when a stress is above its derated limit. */
function ratingsExit(result: RunResult, io: CliIO): number {
  const r = runRatings(result);
  if (r.overLimit === 0) return EXIT_OK;
  const pct = `${Number((r.derating * 100).toPrecision(4))} %`;
  for (const c of r.checks.filter((x) => x.overLimit)) {
    const stress = c.stress === Infinity ? 'unbounded (an impulse in the ideal model)' : formatSI(c.stress, c.unit);
    const over = c.overRating ? `above the rating itself (${formatSI(c.value, c.unit)})` : `above the limit ${formatSI(c.limit, c.unit)} (${pct} of ${formatSI(c.value, c.unit)})`;
    io.stderr.write(`ringdown: RATING EXCEEDED: ${c.part} ${RATING_NAMES[c.rating]} ${stress} is ${over}\n`);
  }
  return EXIT_RATING;
}

/**
 * A progress line on standard error while a run works, when that is a terminal: one line,
 * rewritten at each stage and erased before anything else is written (a run of a large circuit
 * takes seconds to minutes; a small one erases it within milliseconds).
 */
function progressLine(io: CliIO): { say: (stage: string) => void; clear: () => void } | undefined {
  if (io.stderr.isTTY !== true) return undefined;
  let shown = false;
  return {
    say: (stage) => {
      io.stderr.write(`\r\x1b[Kringdown: ${stage}…`);
      shown = true;
    },
    clear: () => {
      if (shown) io.stderr.write('\r\x1b[K');
      shown = false;
    },
  };
}

/** `ringdown run FILE`: analyse, write the report, return the exit code. */
export async function runCommand(file: string, opts: RunOptions, io: CliIO): Promise<number> {
  let source = '';
  const progress = progressLine(io);
  try {
    const { text, name } = await readCircuitText(file, io);
    source = text;
    const analyzeOpts: AnalyzeOptions = {};
    if (opts.samples !== undefined) analyzeOpts.samples = opts.samples;
    if (opts.span !== undefined) analyzeOpts.span = opts.span;
    if (progress) analyzeOpts.progress = progress.say;
    const result = analyzeText(text, name, analyzeOpts);
    progress?.say(opts.format === 'text' ? `writing the report (stress of ${result.circuit.parts.length} parts)` : `writing the ${opts.format} output`);

    const toTerminal = opts.out === undefined;
    const output = render(result, opts, toTerminal && colorEnabled(io.stdout, io.env));
    progress?.clear();
    // The text report lists warnings itself; elsewhere they go to standard error.
    if (!(opts.format === 'text' && toTerminal)) printWarnings(result.circuit.warnings ?? [], source, io);
    if (opts.out !== undefined) {
      try {
        await writeFile(opts.out, output, 'utf8');
      } catch (e) {
        io.stderr.write(`ringdown: cannot write ${opts.out}: ${(e as Error).message}\n`);
        return EXIT_INPUT;
      }
    } else {
      io.stdout.write(output);
    }
    if (opts.plot !== undefined) {
      try {
        await writeFile(opts.plot, renderSVG(result), 'utf8');
      } catch (e) {
        io.stderr.write(`ringdown: cannot write ${opts.plot}: ${(e as Error).message}\n`);
        return EXIT_INPUT;
      }
    }

    // every applicable code is announced on standard error; the most important one is returned
    const codes = [dangerExit(result, io), ratingsExit(result, io)];
    if (!result.crossCheck.passed) {
      const c = result.crossCheck;
      io.stderr.write(
        `ringdown: CROSS-CHECK FAILED: the closed form and ${c.method} differ by ${c.maxRelError.toExponential(1)} (limit ${c.tolerance.toExponential(1)}); do not rely on these results\n`,
      );
      codes.push(EXIT_CROSS_CHECK);
    }
    return exitPriority(codes);
  } catch (e) {
    progress?.clear();
    return reportFailure(e, source, io, opts.debug === true);
  }
}
