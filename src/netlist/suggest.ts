/**
 * Did-you-mean support: the closest candidate by edit distance (adjacent swaps count as one edit,
 * since transposed letters are the most common typo).
 */

export function editDistance(a: string, b: string): number {
  const rows = a.length + 1;
  const cols = b.length + 1;
  const d: number[][] = Array.from({ length: rows }, (_, i) => {
    const row = new Array<number>(cols).fill(0);
    row[0] = i;
    return row;
  });
  for (let j = 0; j < cols; j++) d[0]![j] = j;
  for (let i = 1; i < rows; i++) {
    for (let j = 1; j < cols; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
        best = Math.min(best, d[i - 2]![j - 2]! + 1);
      }
      d[i]![j] = best;
    }
  }
  return d[a.length]![b.length]!;
}

/** How far a guess may be from the word and still be worth suggesting. */
function tolerance(word: string): number {
  if (word.length <= 3) return 1;
  if (word.length <= 6) return 2;
  return 3;
}

/** The closest candidate within tolerance (case differences cost nothing extra), or undefined. */
export function closest(word: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const c of candidates) {
    if (c === word) continue;
    const dist = c.toLowerCase() === word.toLowerCase() ? 0.5 : editDistance(word, c);
    if (dist < bestDistance) {
      best = c;
      bestDistance = dist;
    }
  }
  return best !== undefined && bestDistance <= tolerance(word) ? best : undefined;
}

/** A ready-made hint line, or undefined when nothing is close enough. */
export function didYouMean(word: string, candidates: Iterable<string>): string | undefined {
  const c = closest(word, candidates);
  return c === undefined ? undefined : `did you mean '${c}'?`;
}
