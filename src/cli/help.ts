/** Example sections shown by --help. */
export const PROGRAM_EXAMPLES = `
Examples:
  ringdown run filter.rdn                             full text report with charts
  ringdown run filter.rdn --format csv --out v.csv    samples for a spreadsheet
  ringdown run filter.rdn --format json               everything, for other programs
  ringdown run filter.rdn --format numbers            key=value lines, for scripts
  ringdown check filter.rdn                           the circuit as ringdown reads it

Exit codes: 0 ok, 1 internal error, 2 problems in the input, 3 the in-run cross-check failed,
4 a part's stress is above its derated rating (a CI job can gate on it), 5 a danger caution
fired (hazardous voltage or stored energy, no discharge path, interrupted inductor current).
When several apply: 3 first (no figure can be trusted), then 5 (people), then 4 (parts).
`;

export const RUN_EXAMPLES = `
Examples:
  ringdown run snubber.rdn
  ringdown run snubber.rdn --span 2ms --samples 4001
  ringdown run snubber.rdn --format json --out result.json
  ringdown run snubber.rdn --no-chart --plot snubber.svg
  ringdown run snubber.rdn --format csv > samples.csv
  cat snubber.rdn | ringdown run - --no-chart
`;

export const CHECK_EXAMPLES = `
Examples:
  ringdown check snubber.rdn
  cat snubber.rdn | ringdown check -
`;
