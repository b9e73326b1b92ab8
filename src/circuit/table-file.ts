import { readFileSync, statSync } from 'node:fs';
import { MAX_FILE_BYTES } from './limits.js';
import { dirname, isAbsolute, join } from 'node:path';
import { raise } from '../netlist/errors.js';
import { rememberSource } from '../netlist/format.js';
import type { SourceLocation } from '../netlist/location.js';
import type { EvalContext } from './evaluate.js';

/**
 * `table file "drive.csv"`: two columns, time in seconds and value in volts or amperes, plain
 * numbers (e-notation allowed). Fields are separated by commas, semicolons or white space (the
 * first data line decides); a first line that is not numbers is a header; blank lines and lines
 * starting with # are skipped. Problems point into the CSV file itself.
 */

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
/** Enough to show a pattern; a wholly wrong file would otherwise bury everything else. */
const MAX_FILE_ERRORS = 10;

interface Field {
  text: string;
  /** 0-based index in the line. */
  start: number;
}

/** The path as written, relative to the circuit file's folder unless absolute. */
export function tablePath(written: string, circuitFile: string): string {
  return isAbsolute(written) ? written : join(dirname(circuitFile), written);
}

export function readTableFile(written: string, pathLoc: SourceLocation, ctx: EvalContext): { t: number; v: number }[] | undefined {
  const path = tablePath(written, pathLoc.file);
  let text: string;
  try {
    // a device or pipe (/dev/urandom, /dev/zero) never ends and a huge file fills the memory:
    // only regular files, and no larger than a circuit file may be
    const st = statSync(path);
    if (!st.isFile() && !st.isDirectory()) {
      raise(ctx.sink, 'error', pathLoc, `cannot read table file '${path}': it is not a regular file (a device, pipe or socket)`, { hint: 'save the samples to a file first' });
      return undefined;
    }
    if (st.size > MAX_FILE_BYTES) {
      raise(ctx.sink, 'error', pathLoc, `table file '${path}' is ${(st.size / (1024 * 1024)).toFixed(1)} MB, more than the ${MAX_FILE_BYTES / (1024 * 1024)} MB a table file may have`, {
        hint: 'keep every n-th sample (a scope capture is usually far denser than the circuit needs)',
      });
      return undefined;
    }
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
    raise(ctx.sink, 'error', pathLoc, `cannot read table file '${path}': ${why}`, {
      hint: isAbsolute(written) ? undefined : `the path is taken relative to the folder of ${pathLoc.file}`,
    });
    return undefined;
  }
  rememberSource(path, text);

  const before = ctx.sink.length;
  const at = (line: number, col: number, length: number): SourceLocation => ({ file: path, line, col, length: Math.max(1, length) });
  const fail = (loc: SourceLocation, message: string, hint?: string): void => {
    if (ctx.sink.length - before < MAX_FILE_ERRORS) raise(ctx.sink, 'error', loc, message, { hint });
  };

  const points: { t: number; v: number }[] = [];
  const pointLine: number[] = [];
  let separator: RegExp | undefined;
  let firstRow = true;
  const lines = text.replace(/^\uFEFF/, '').split('\n');
  lines.forEach((raw, index) => {
    const lineNo = index + 1;
    const line = raw.replace(/\r$/, '');
    const trimmed = line.trim();
    if (trimmed === '' || trimmed.startsWith('#')) return;
    separator ??= line.includes(';') ? /;/g : line.includes(',') ? /,/g : /[ \t]+/g;
    const fields = splitFields(line, separator);
    const isHeader = firstRow && fields.some((f) => !NUMBER.test(f.text));
    firstRow = false;
    if (isHeader) return;
    if (fields.length !== 2) {
      fail(at(lineNo, 1, line.length), `expected two columns (time and value), found ${fields.length}`);
      return;
    }
    const [tf, vf] = fields as [Field, Field];
    let good = true;
    for (const f of fields) {
      if (!NUMBER.test(f.text)) {
        fail(at(lineNo, f.start + 1, f.text.length), f.text === '' ? 'missing number' : `'${f.text}' is not a number`, 'table files hold plain numbers in seconds and in volts or amperes, such as 1.5e-3');
        good = false;
      }
    }
    if (!good) return;
    const t = Number(tf.text);
    const v = Number(vf.text);
    const prev = points[points.length - 1];
    if (prev && !(t > prev.t)) {
      fail(at(lineNo, tf.start + 1, tf.text.length), `table times must increase: ${t} s does not come after ${prev.t} s (line ${pointLine[pointLine.length - 1]})`);
      return;
    }
    points.push({ t, v });
    pointLine.push(lineNo);
  });
  if (ctx.sink.length > before) return undefined;
  if (points.length < 2) {
    raise(ctx.sink, 'error', pathLoc, `table file '${path}' needs at least two rows of time and value, found ${points.length}`);
    return undefined;
  }
  return points;
}

/** Fields with their positions, surrounding blanks trimmed. */
function splitFields(line: string, separator: RegExp): Field[] {
  const fields: Field[] = [];
  const whitespace = separator.source === '[ \\t]+';
  const body = whitespace ? line.trim() : line;
  const offset = whitespace ? line.indexOf(body) : 0;
  let start = 0;
  for (const m of body.matchAll(separator)) {
    fields.push(trimField(body.slice(start, m.index), offset + start));
    start = m.index + m[0].length;
  }
  fields.push(trimField(body.slice(start), offset + start));
  return fields;
}

function trimField(text: string, start: number): Field {
  const lead = text.length - text.trimStart().length;
  return { text: text.trim(), start: start + lead };
}
