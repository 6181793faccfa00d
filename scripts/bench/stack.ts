/**
 * Figures 1a/1b: our whole server (express front door, React Router, our
 * middleware, root loader) against the minimal app built from the same
 * node_modules, on the lightest resource route and on a simple page. The two
 * servers are loaded in turns (ours, the minimal app, ours, …) so a burst of
 * load from others on the machine lands on both alike; each ratio is the
 * median of the per-turn ratios. Each turn also reads the CPU time both
 * processes spent per answer, the steadier figure on a shared machine.
 */
import { readFileSync } from "node:fs";
import autocannon from "autocannon";

/** One server under test: where it answers and its process, whose CPU time is read. */
export type StackServer = { url: string; pid: number };

export type StackRatio = {
  ours: number;
  minimal: number;
  ratio: number;
  ratios: number[];
  notOk: number;
  /** CPU time each server's process spent per answer, ms (median of the turns), and minimal ÷ ours. */
  cpuOurs: number;
  cpuMinimal: number;
  cpuRatio: number;
};

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

/**
 * The user + system CPU time a process has used, ms (Linux /proc; clock ticks
 * of 10 ms). Unlike answers a second, it hardly moves when others load the
 * machine: a process waiting for a core spends no CPU time meanwhile.
 */
function cpuMilliseconds(pid: number) {
  const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
  return (Number(fields[11]) + Number(fields[12])) * 10;
}

async function load(server: StackServer, path: string, seconds: number, headers: Record<string, string> = {}) {
  const cpuBefore = cpuMilliseconds(server.pid);
  const result = (await autocannon({ url: server.url + path, connections: 10, duration: seconds, headers })) as autocannon.Result;
  return {
    perSecond: result.requests.average,
    cpuPerAnswer: (cpuMilliseconds(server.pid) - cpuBefore) / Math.max(1, result.requests.total),
    notOk: result.non2xx + result.errors + result.timeouts,
  };
}

/**
 * `turns` alternating runs of `seconds` each on both servers. `headers` go to
 * both (say, the Accept-Encoding a browser sends, which only our server acts on).
 */
export async function compareStacks(
  ours: StackServer,
  minimal: StackServer,
  [oursPath, minimalPath]: [string, string],
  { turns = 3, seconds = 4, headers = {} as Record<string, string> } = {},
): Promise<StackRatio> {
  // One short warm-up each: the first requests compile code paths in both servers.
  await load(ours, oursPath, 1);
  await load(minimal, minimalPath, 1);
  const a: Awaited<ReturnType<typeof load>>[] = [];
  const b: typeof a = [];
  for (let turn = 0; turn < turns; turn++) {
    a.push(await load(ours, oursPath, seconds, headers));
    b.push(await load(minimal, minimalPath, seconds, headers));
  }
  const ratios = a.map((turn, i) => turn.perSecond / b[i]!.perSecond);
  const cpuOurs = median(a.map((turn) => turn.cpuPerAnswer));
  const cpuMinimal = median(b.map((turn) => turn.cpuPerAnswer));
  return {
    ours: median(a.map((turn) => turn.perSecond)),
    minimal: median(b.map((turn) => turn.perSecond)),
    ratio: median(ratios),
    ratios,
    notOk: [...a, ...b].reduce((sum, turn) => sum + turn.notOk, 0),
    cpuOurs,
    cpuMinimal,
    cpuRatio: cpuMinimal / cpuOurs,
  };
}
