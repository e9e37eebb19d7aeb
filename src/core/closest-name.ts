/**
 * "Did you mean" suggestions for misspelt names (log columns, fields of JSON files, rule parameters): the candidate with the
 * smallest Levenshtein edit distance (case-insensitive), if it is close enough.
 */

/** Levenshtein edit distance (insertions, deletions, substitutions each cost 1). */
export function editDistance(a: string, b: string): number {
  const previous = new Array<number>(b.length + 1);
  const current = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j += 1) previous[j] = j;
  for (let i = 1; i <= a.length; i += 1) {
    current[0] = i;
    for (let j = 1; j <= b.length; j += 1) {
      const substitution = previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1);
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, substitution);
    }
    for (let j = 0; j <= b.length; j += 1) previous[j] = current[j];
  }
  return previous[b.length];
}

/**
 * The candidate closest to `name`, or null when none is within
 * max(2, ⌊length/3⌋) edits. Ties keep the earlier candidate (stable).
 */
export function closestName(name: string, candidates: readonly string[]): string | null {
  const target = name.toLowerCase();
  const limit = Math.max(2, Math.floor(name.length / 3));
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of candidates) {
    const distance = editDistance(target, candidate.toLowerCase());
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return bestDistance <= limit ? best : null;
}
