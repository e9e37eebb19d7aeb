/** Element ids unique within one report, numbered in drawing order (the same inputs give the same ids). */
export interface IdSource {
  next(prefix: string): string;
}

export function idSource(): IdSource {
  const counts = new Map<string, number>();
  return {
    next(prefix: string): string {
      const count = (counts.get(prefix) ?? 0) + 1;
      counts.set(prefix, count);
      return `${prefix}-${count}`;
    },
  };
}
