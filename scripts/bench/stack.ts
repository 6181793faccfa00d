/**
 * Figures 1a/1b: our whole server (express front door, React Router, our
 * middleware, root loader) against the minimal app built from the same
 * node_modules, on the lightest resource route and on a simple page. The two
 * servers are loaded in turns (ours, the minimal app, ours, …) so a burst of
 * load from others on the machine lands on both alike; each ratio is the
 * median of the per-turn ratios.
 */
import autocannon from "autocannon";

export type StackRatio = { ours: number; minimal: number; ratio: number; ratios: number[]; notOk: number };

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

async function requestsPerSecond(url: string, seconds: number, headers: Record<string, string> = {}) {
  const result = (await autocannon({ url, connections: 10, duration: seconds, headers })) as autocannon.Result;
  return { perSecond: result.requests.average, notOk: result.non2xx + result.errors + result.timeouts };
}

/**
 * `turns` alternating runs of `seconds` each on both servers. `headers` go to
 * both (say, the Accept-Encoding a browser sends, which only our server acts on).
 */
export async function compareStacks(oursUrl: string, minimalUrl: string, { turns = 3, seconds = 4, headers = {} as Record<string, string> } = {}): Promise<StackRatio> {
  // One short warm-up each: the first requests compile code paths in both servers.
  await requestsPerSecond(oursUrl, 1);
  await requestsPerSecond(minimalUrl, 1);
  const ours: number[] = [];
  const minimal: number[] = [];
  let notOk = 0;
  for (let turn = 0; turn < turns; turn++) {
    const a = await requestsPerSecond(oursUrl, seconds, headers);
    const b = await requestsPerSecond(minimalUrl, seconds, headers);
    ours.push(a.perSecond);
    minimal.push(b.perSecond);
    notOk += a.notOk + b.notOk;
  }
  const ratios = ours.map((value, i) => value / minimal[i]!);
  return { ours: median(ours), minimal: median(minimal), ratio: median(ratios), ratios, notOk };
}
