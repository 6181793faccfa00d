/**
 * Caches a pure function of numbers. Critical values depend only on (p, n, α),
 * and a study has few distinct combinations, so each quantile is computed once.
 */
export function memoize<Args extends number[], Result>(
  fn: (...args: Args) => Result,
): (...args: Args) => Result {
  const cache = new Map<string, Result>();
  return (...args: Args): Result => {
    const key = args.join(",");
    if (cache.has(key)) return cache.get(key) as Result;
    const result = fn(...args);
    cache.set(key, result);
    return result;
  };
}
