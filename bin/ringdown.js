#!/usr/bin/env node
import { main } from '../dist/cli/main.js';

// A reader that stops early (`ringdown run x | head`) is not an error.
process.stdout.on('error', (error) => {
  if (error && error.code === 'EPIPE') process.exit(0);
  throw error;
});

main(process.argv).then(
  (code) => {
    process.exitCode = code;
  },
  (error) => {
    process.stderr.write(`ringdown: internal error: ${error instanceof Error ? error.message : String(error)}\n`);
    if (process.argv.includes('--debug') && error instanceof Error && error.stack) process.stderr.write(error.stack + '\n');
    process.exitCode = 1;
  },
);
