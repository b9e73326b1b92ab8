import { createRequire } from 'node:module';

/** The package version, read from package.json (two levels up from src/cli and from dist/cli). */
export function packageVersion(): string {
  try {
    const require = createRequire(import.meta.url);
    const pkg = require('../../package.json') as { version?: string };
    return pkg.version ?? 'unknown';
  } catch {
    return 'unknown';
  }
}
