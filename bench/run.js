// ringdown benchmark: whole-pipeline runs against scipy.signal.lsim on the same exported model,
// a long PWM run (10 000 periods) against lsim and against exact references, and the dense
// eigen-solver against numpy.linalg.eig (and ml-matrix).
// ringdown is timed as analyzeText(text, file, { partSignals: false }): the samples only, without the
// per-part closed forms that only the text report needs.
//
//   npm run bench                    table on stdout
//   npm run bench -- --json          rows as a JSON array on stdout (notes go to stderr)
//   options: --states 100,400        state counts for the circuit cases (default 100,400,1000)
//            --eig 100,400,800       matrix sizes for the eig rows
//            --timeout 180            seconds per circuit case before it is skipped
//            --no-pwm                 skip the PWM case
//            --runs 5                 repetitions after the first call (medians are reported; default 5,
//                                     15 for cases of 100 states or fewer and the PWM case)
//            --no-ml                  skip the ml-matrix column of the eig rows
//
// Speed figures are wall-clock medians on this machine; the ratio is ours / reference (> 1: we are
// slower). The reference simulates the model ringdown built, so it does not parse or build.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const HERE = dirname(fileURLToPath(import.meta.url));
const ROOT = join(HERE, '..');
const argv = process.argv.slice(2);
const USAGE = `usage: npm run bench [-- options]

Times ringdown's whole pipeline against scipy.signal.lsim on the same models and grids, a long PWM
run against lsim and exact references, and the dense eigen-solver against numpy.linalg.eig.

options:
  --json               rows as a JSON array on stdout (notes go to stderr)
  --states 100,400     state counts for the circuit cases (default 100,400,1000)
  --eig 100,400,800    matrix sizes for the eig rows (default 100,400,800)
  --timeout 180        seconds per circuit case before it is skipped (default 180)
  --runs 5             timed repetitions after the first call; medians are reported (default 5,
                       15 for cases of 100 states or fewer and the PWM case)
  --no-pwm             skip the PWM case
  --no-ml              skip the ml-matrix column of the eig rows
  --help               this text

examples:
  npm run bench
  npm run bench -- --states 100,400 --eig 400 --no-pwm
  npm run bench -- --json > bench.json`;
const VALUED = ['--states', '--eig', '--timeout', '--runs'];
const FLAGS = ['--json', '--no-pwm', '--no-ml', '--help', '-h'];
for (let i = 0; i < argv.length; i++) {
  const a = argv[i];
  if (VALUED.includes(a)) {
    const v = argv[++i];
    const list = a === '--states' || a === '--eig';
    const ok = v !== undefined && (list ? /^\d+(,\d+)*$/.test(v) : /^\d+(\.\d+)?$/.test(v) && Number(v) > 0);
    if (!ok) {
      console.error(`bench: ${a} needs ${list ? 'a comma-separated list of sizes, e.g. 100,400' : 'a positive number'}${v === undefined ? '' : `, got '${v}'`}`);
      process.exit(2);
    }
  } else if (!FLAGS.includes(a)) {
    console.error(`bench: unknown option '${a}'\n\n${USAGE}`);
    process.exit(2);
  }
}
if (argv.includes('--help') || argv.includes('-h')) {
  console.log(USAGE);
  process.exit(0);
}
const flag = (name) => argv.includes(name);
const opt = (name, dflt) => {
  const i = argv.indexOf(name);
  return i >= 0 && i + 1 < argv.length ? argv[i + 1] : dflt;
};
const JSON_OUT = flag('--json');
const STATES = opt('--states', '100,400,1000').split(',').map(Number);
const EIG_SIZES = opt('--eig', '100,400,800').split(',').map(Number);
const TIMEOUT = Number(opt('--timeout', '180'));
const WITH_PWM = !flag('--no-pwm');
const RUNS = Number(opt('--runs', '5'));
// cases of 100 states or fewer take tens of milliseconds on both sides, where one run's noise
// (a garbage collection, the scheduler) is a large share: 15 repetitions each unless --runs says
const SHORT_RUNS = 15;
const runsFor = (states) => (argv.includes('--runs') || states > 100 ? RUNS : Math.max(RUNS, SHORT_RUNS));
const WITH_ML = !flag('--no-ml');
const SAMPLES = 10000;
const say = (...a) => (JSON_OUT ? console.error(...a) : console.log(...a));

// ---- build when dist is missing or older than src ----
function newest(dir) {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}
const distEntry = join(ROOT, 'dist', 'pipeline.js');
if (!existsSync(distEntry) || !existsSync(join(ROOT, 'dist', 'linalg', 'eig.js')) || statSync(distEntry).mtimeMs < newest(join(ROOT, 'src'))) {
  say('dist/ is missing or older than src/: running npm run build');
  const b = spawnSync('npm', ['run', 'build'], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8' });
  if (b.status !== 0) {
    if (!existsSync(distEntry)) {
      console.error(b.stdout, b.stderr);
      process.exit(1);
    }
    say('note: npm run build reported errors (files were still emitted); benchmarking the emitted dist/');
  }
}

// ---- python / scipy ----
const py = spawnSync('python3', ['-c', 'import numpy, scipy; print(numpy.__version__, scipy.__version__)'], { encoding: 'utf8' });
const HAVE_PY = py.status === 0;
if (!HAVE_PY) say('python3 with numpy/scipy not found: reference columns are skipped');
else say(`reference: numpy ${py.stdout.trim().split(' ')[0]}, scipy ${py.stdout.trim().split(' ')[1]}`);
if (process.env.OPENBLAS_CORETYPE) say(`note: OPENBLAS_CORETYPE=${process.env.OPENBLAS_CORETYPE} is set in the environment (numpy's BLAS kernels)`);

const load = () => loadavg().map((v) => v.toFixed(2)).join(' ');
const LOAD_START = load();
say(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? '?'}), Node ${process.version}; load average (1, 5, 15 min) at start: ${LOAD_START}`);
say('ringdown is timed as analyzeText(text, file, { partSignals: false }): samples only, no per-part closed forms');

const tmp = mkdtempSync(join(tmpdir(), 'ringdown-bench-'));
process.on('exit', () => rmSync(tmp, { recursive: true, force: true }));

/** Runs a child and collects its output; kills it (by its pid) after `timeout` seconds. */
function run(cmd, args, timeout) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    let timedOut = false;
    const timer = setTimeout(() => {
      timedOut = true;
      child.kill('SIGKILL');
    }, timeout * 1000);
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (err += d));
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code, out, err, timedOut });
    });
  });
}

const lastJson = (text, prefix = '') => {
  const line = text
    .trim()
    .split('\n')
    .reverse()
    .find((l) => l.startsWith(prefix + '{') || (prefix && l.startsWith(prefix)));
  return line ? JSON.parse(line.slice(prefix.length)) : null;
};
const stagesOf = (text) =>
  text
    .split('\n')
    .filter((l) => l.startsWith('STAGE '))
    .map((l) => l.split(' ').slice(1))
    .map(([name, s]) => `${name} ${Number(s).toFixed(3)} s`);

const rows = [];
const circuitEigRows = [];
const stageNotes = [];
// src/model/reduce.ts spreads whole matrices into Math.max(...), which overflows V8's default stack
// (RangeError) from about 400 states; the circuit cases therefore run with a raised stack limit.
const BIG_STACK = 'ulimit -s unlimited 2>/dev/null || ulimit -s 1048576 2>/dev/null; exec node --stack-size=60000 "$@"';
say('note: circuit cases run with node --stack-size=60000 under a raised ulimit -s (src/model/reduce.ts spreads large arrays into Math.max)');

for (const name of ['rc-ladder', 'lc-ladder', 'rlc-mesh']) {
  let tooSlow = 0;
  for (const states of STATES) {
    const file = join(tmp, `${name}-${states}.json`);
    if (tooSlow) {
      const why = `skipped: the ${tooSlow}-state case already exceeded the ${TIMEOUT} s time box`;
      say(`${name} ${states}: ${why}`);
      stageNotes.push({ case: name, states, stages: [], note: why });
      rows.push({ case: name, states, samples: SAMPLES, oursSeconds: null, referenceSeconds: null, ratio: null, maxRelError: null });
      continue;
    }
    const t = Date.now();
    const r = await run('sh', ['-c', BIG_STACK, 'sh', join(HERE, 'case.js'), 'circuit', name, String(states), String(SAMPLES), String(runsFor(states)), file], TIMEOUT);
    const stages = stagesOf(r.out);
    const res = r.code === 0 ? lastJson(r.out, 'RESULT ') : null;
    if (!res) {
      if (r.timedOut) tooSlow = states;
      const why = r.timedOut ? `skipped after ${TIMEOUT} s` : `failed (exit ${r.code}): ${r.err.trim().split('\n').filter((l) => !/^\s+at /.test(l)).slice(-3).join(' | ')}`;
      say(`${name} ${states}: ${why}; stages seen: ${stages.join(', ') || 'none'}`);
      stageNotes.push({ case: name, states, stages, note: why });
      rows.push({ case: name, states, samples: SAMPLES, oursSeconds: null, referenceSeconds: null, ratio: null, maxRelError: null });
      continue;
    }
    stageNotes.push({ case: name, states, stages, note: `${((Date.now() - t) / 1000).toFixed(1)} s wall, load ${load()}` });
    let ref = null;
    if (HAVE_PY) {
      const p = await run('python3', [join(HERE, 'reference.py'), 'lsim', file, String(runsFor(states))], 600);
      ref = p.code === 0 ? lastJson(p.out) : null;
      if (!ref) say(`${name} ${states}: reference failed: ${p.err.trim().split('\n').slice(-2).join(' | ')}`);
    }
    rows.push({
      case: name,
      states: res.states,
      samples: res.samples,
      oursSeconds: res.oursSeconds,
      firstCallSeconds: res.firstCallSeconds,
      referenceSeconds: ref ? ref.referenceSeconds : null,
      ratio: ref ? res.oursSeconds / ref.referenceSeconds : null,
      maxRelError: ref ? ref.maxRelError : null,
    });
    circuitEigRows.push({
      case: `eig-${name}`,
      states: res.states,
      samples: 0,
      oursSeconds: res.eigSeconds,
      referenceSeconds: ref ? ref.eigSeconds : null,
      ratio: ref ? res.eigSeconds / ref.eigSeconds : null,
      maxRelError: null,
    });
  }
}

// ---- PWM: 100 kHz pulse train into an LC filter for 10 000 periods (bench/pwm-long.rdn) ----
let pwm = null;
if (WITH_PWM) {
  const file = join(tmp, 'pwm-long.json');
  const t = Date.now();
  const r = await run('node', [join(HERE, 'case.js'), 'pwm', join(HERE, 'pwm-long.rdn'), String(runsFor(2)), file], Math.max(TIMEOUT, 300));
  const res = r.code === 0 ? lastJson(r.out, 'RESULT ') : null;
  if (!res) say(`pwm-long: ${r.timedOut ? 'skipped after the time box' : `failed (exit ${r.code}): ${r.err.trim().split('\n').slice(-3).join(' | ')}`}`);
  else {
    let ref = null;
    if (HAVE_PY) {
      const p = await run('python3', [join(HERE, 'reference.py'), 'pwm', file, String(Math.max(runsFor(2), 5))], 600);
      ref = p.code === 0 ? lastJson(p.out) : null;
      if (!ref) say(`pwm-long: reference failed: ${p.err.trim().split('\n').slice(-2).join(' | ')}`);
    }
    pwm = { ...res, ref, wall: (Date.now() - t) / 1000, load: load() };
    rows.push({
      case: 'pwm-long',
      states: res.states,
      samples: res.samples,
      oursSeconds: res.oursSeconds,
      firstCallSeconds: res.firstCallSeconds,
      referenceSeconds: ref ? ref.referenceSeconds : null,
      ratio: ref ? res.oursSeconds / ref.referenceSeconds : null,
      maxRelError: ref ? ref.lsimMaxRelDiff : null,
      fineMaxRelError: ref ? ref.fineMaxRelDiff : null,
      fine1msMaxRelError: ref ? ref.fine1msMaxRelDiff : null,
    });
  }
}

const eigRows = [];
for (const n of EIG_SIZES) {
  const file = join(tmp, `eig-${n}.json`);
  const ml = WITH_ML && n <= 400 ? 'ml' : '';
  const r = await run('node', [join(HERE, 'case.js'), 'eig', String(n), String(RUNS), file, ml], 900);
  const res = r.code === 0 ? lastJson(r.out, 'RESULT ') : null;
  if (!res) {
    say(`eig ${n}: failed: ${r.err.trim().split('\n').slice(-3).join(' | ')}`);
    continue;
  }
  let ref = null;
  if (HAVE_PY) {
    const p = await run('python3', [join(HERE, 'reference.py'), 'eig', file, String(Math.max(RUNS, 5))], 600);
    ref = p.code === 0 ? lastJson(p.out) : null;
  }
  eigRows.push({
    case: 'eig-random',
    states: n,
    samples: 0,
    oursSeconds: res.oursSeconds,
    referenceSeconds: ref ? ref.referenceSeconds : null,
    ratio: ref ? res.oursSeconds / ref.referenceSeconds : null,
    maxRelError: ref ? ref.maxRelError : null,
    mlMatrixSeconds: res.mlSeconds,
    residual: res.residual,
  });
}

if (JSON_OUT) {
  const keys = ['case', 'states', 'samples', 'oursSeconds', 'referenceSeconds', 'ratio', 'maxRelError', 'firstCallSeconds', 'fineMaxRelError', 'fine1msMaxRelError'];
  const pick = (r) => Object.fromEntries(keys.filter((k) => k in r).map((k) => [k, r[k]]));
  console.log(JSON.stringify([...rows, ...circuitEigRows, ...eigRows].map(pick), null, 2));
  for (const s of stageNotes) console.error(`stages ${s.case} ${s.states}: ${s.stages.join(', ')} (${s.note})`);
  console.error(`load average (1, 5, 15 min): ${LOAD_START} at start, ${load()} at the end`);
} else {
  const f = (v, d = 3) => (v === null || v === undefined ? '—' : v.toFixed(d));
  const e = (v) => (v === null || v === undefined ? '—' : v.toExponential(1));
  console.log('\nWhole pipeline (analyzeText with { partSignals: false }: parse, model, modal form, exact solution,');
  console.log('cross-check, metrics; no per-part closed forms) vs scipy.signal.lsim on the model ringdown exported');
  console.log(`(same grid, x(0) = 0; ladder/mesh cases: 1 V step input). Medians of ${runsFor(1000)} runs each (${runsFor(100)} for 100 states or fewer) after a first call and 3 warm-up calls. "max rel diff" is`);
  console.log('|ours − lsim| relative to each signal\'s peak; "vs exact" (pwm-long only) is |ours − exact reference|:\n');
  console.log(['case'.padEnd(10), 'states'.padStart(6), 'samples'.padStart(8), 'ours s'.padStart(9), 'ref s'.padStart(9), 'ratio'.padStart(8), 'max rel diff'.padStart(13), 'vs exact'.padStart(9), '1st call s'.padStart(11)].join('  '));
  for (const r of rows) {
    console.log([r.case.padEnd(10), String(r.states).padStart(6), String(r.samples).padStart(8), f(r.oursSeconds).padStart(9), f(r.referenceSeconds).padStart(9), f(r.ratio, 2).padStart(8), e(r.maxRelError).padStart(13), e(r.fineMaxRelError).padStart(9), f(r.firstCallSeconds).padStart(11)].join('  '));
  }
  console.log('("ours s": median of the calls after the first and 3 warm-up calls; "1st call s": the first call in a fresh process,');
  console.log(' JIT warm-up included, which is what one command-line run pays on top of starting Node)');
  if (pwm) {
    const ref = pwm.ref;
    console.log(`\npwm-long (bench/pwm-long.rdn): 100 kHz, 12 V, 42 % duty, 20 ns edges into 10 µH / 22 µF (15 mΩ ESR) / 2.5 Ω;`);
    console.log(`100 ms = 10 000 periods, ${pwm.samples} samples, ${pwm.states} states. ringdown ${f(pwm.oursSeconds)} s (median of ${runsFor(2)}), in-run cross-check ${e(pwm.crossCheck)}.`);
    if (ref) {
      console.log(`  lsim, input sampled on the same ${pwm.samples}-point grid: ${f(ref.referenceSeconds, 4)} s (median of ${Math.max(runsFor(2), 5)}), ratio ours/lsim ${f(pwm.oursSeconds / ref.referenceSeconds, 1)}.`);
      console.log(`    max |ours − lsim| = ${e(ref.lsimMaxRelDiff)} of the peak (${ref.peak.map((v) => v.toFixed(3)).join(', ')} V). This is lsim's error, not ours: with two`);
      console.log('    samples per period, linear interpolation between samples is not the pulse train (lsim vs the exact');
      console.log(`    reference below: ${e(ref.lsimVsExact)}). lsim is not an exact reference for this input.`);
      console.log(`  exact reference (periodic state + expm(A·kT) per period + exact steps between pulse corners), whole span:`);
      console.log(`    max |ours − exact| = ${e(ref.fineMaxRelDiff)} of the peak (reference took ${f(ref.fineSeconds, 1)} s; not a speed comparison)`);
      if (ref.fine1msMaxRelDiff !== null)
        console.log(`  lsim on a ${(ref.fine1msStep * 1e9).toFixed(0)} ns grid through every pulse corner, first 1 ms: max |ours − it| = ${e(ref.fine1msMaxRelDiff)} of the peak`);
    }
  }
  console.log('\nStage timings (one run each; the current simulate() rebuilds the model and modal form itself):');
  for (const s of stageNotes) console.log(`  ${s.case} ${s.states}: ${s.stages.join(', ')} (${s.note})`);
  if (pwm) console.log(`  pwm-long: ${pwm.wall.toFixed(1)} s wall with the references, load ${pwm.load}`);
  console.log('\nEigen-decomposition of each circuit\'s own state matrix (values and vectors; ours picks the symmetric route');
  console.log('when the matrix is diagonally similar to a symmetric one, as for RC networks) vs numpy.linalg.eig on the same matrix:\n');
  console.log(['case'.padEnd(16), 'states'.padStart(6), 'ours s'.padStart(9), 'numpy s'.padStart(9), 'ratio'.padStart(7)].join('  '));
  for (const r of circuitEigRows) console.log([r.case.padEnd(16), String(r.states).padStart(6), f(r.oursSeconds, 4).padStart(9), f(r.referenceSeconds, 4).padStart(9), f(r.ratio, 2).padStart(7)].join('  '));
  console.log('\nDense eigen-decomposition, random n×n (values and vectors) vs numpy.linalg.eig (values and vectors), and ml-matrix:\n');
  console.log(['n'.padStart(5), 'ours s'.padStart(9), 'numpy s'.padStart(9), 'ratio'.padStart(7), 'ml-matrix s'.padStart(12), 'ml/ours'.padStart(8), 'eig diff'.padStart(9), 'residual'.padStart(9)].join('  '));
  for (const r of eigRows) {
    console.log([String(r.states).padStart(5), f(r.oursSeconds).padStart(9), f(r.referenceSeconds, 4).padStart(9), f(r.ratio, 1).padStart(7), f(r.mlMatrixSeconds).padStart(12), (r.mlMatrixSeconds ? (r.mlMatrixSeconds / r.oursSeconds).toFixed(1) : '—').padStart(8), e(r.maxRelError).padStart(9), e(r.residual).padStart(9)].join('  '));
  }
  console.log(`\nload average (1, 5, 15 min): ${LOAD_START} at start, ${load()} at the end (2 cores: above 2 means waiting for a core)`);
}
