// Loopback load benchmark: a production server (`next start` from the build in NEXT_DIST_DIR,
// default .next-test, on a fresh SQLite file, via tests/helpers/server.ts), one signed-in
// designer, and an open-loop generator that sends a mix of authenticated GET /api/boards,
// GET /api/scenarios?boardId= and GET /api/health at 50, 100 and 200 requests per second for
// a few seconds each. Prints p50/p95/p99 per route and rate. Bounded in count and time, stops by
// itself, and only ever talks to 127.0.0.1. The load generator shares the machine's cores with
// the server, so figures are an upper bound on latency.
//
//   npx tsx scripts/bench-load.ts [--seconds 5] [--rates 50,100,200]
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { signIn, startServer } from "@/tests/helpers/server";

interface Row {
  rate: number;
  route: string;
  n: number;
  errors: number;
  p50: number;
  p95: number;
  p99: number;
}

const arg = (name: string, fallback: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
};

const quantile = (sorted: number[], q: number) =>
  sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] : NaN;

export async function runLoadBench({
  seconds = 5,
  rates = [50, 100, 200],
}: {
  seconds?: number;
  rates?: number[];
} = {}): Promise<Row[]> {
  const bounded = Math.min(Math.max(seconds, 1), 30);
  const server = await startServer();
  const rows: Row[] = [];
  try {
    const loopback = new URL(server.url).hostname;
    if (!["127.0.0.1", "localhost", "::1", "[::1]"].includes(loopback))
      throw new Error(`refusing a non-loopback target ${server.url}`);
    const s = await signIn(server.url, "designer@fjordline.example", DEMO_PASSWORD);
    const boards = (await (await s.fetch("/api/boards")).json()) as { items: { id: string }[] };
    const boardId = boards.items[0].id;
    const routes: { name: string; path: string; auth: boolean }[] = [
      { name: "GET /api/boards", path: "/api/boards", auth: true },
      { name: "GET /api/scenarios?boardId=", path: `/api/scenarios?boardId=${boardId}`, auth: true },
      { name: "GET /api/health", path: "/api/health", auth: false },
    ];
    for (const rate of rates.map((r) => Math.min(Math.max(r, 1), 500))) {
      const times = new Map<string, number[]>(routes.map((r) => [r.name, []]));
      const errors = new Map<string, number>(routes.map((r) => [r.name, 0]));
      const total = Math.round(rate * bounded);
      const started = performance.now();
      const inFlight: Promise<void>[] = [];
      for (let i = 0; i < total; i++) {
        // Open loop: request i leaves at i/rate seconds whatever the earlier ones are doing.
        const due = started + (i * 1000) / rate;
        const wait = due - performance.now();
        if (wait > 0) await new Promise((r) => setTimeout(r, wait));
        const route = routes[i % routes.length];
        inFlight.push(
          (async () => {
            const t0 = performance.now();
            try {
              const res = route.auth
                ? await s.fetch(route.path, { signal: AbortSignal.timeout(15_000) })
                : await fetch(`${server.url}${route.path}`, { signal: AbortSignal.timeout(15_000) });
              await res.arrayBuffer();
              if (res.status !== 200) errors.set(route.name, errors.get(route.name)! + 1);
            } catch {
              errors.set(route.name, errors.get(route.name)! + 1);
            }
            times.get(route.name)!.push(performance.now() - t0);
          })(),
        );
      }
      await Promise.all(inFlight);
      for (const r of routes) {
        const sorted = [...times.get(r.name)!].sort((a, b) => a - b);
        rows.push({
          rate,
          route: r.name,
          n: sorted.length,
          errors: errors.get(r.name)!,
          p50: quantile(sorted, 0.5),
          p95: quantile(sorted, 0.95),
          p99: quantile(sorted, 0.99),
        });
      }
    }
  } finally {
    await server.stop();
  }
  return rows;
}

export function formatLoadRows(rows: Row[]): string {
  const head = `${"rate".padStart(6)}  ${"route".padEnd(30)} ${"n".padStart(5)} ${"err".padStart(4)} ${"p50 ms".padStart(8)} ${"p95 ms".padStart(8)} ${"p99 ms".padStart(8)}`;
  const lines = rows.map(
    (r) =>
      `${`${r.rate}/s`.padStart(6)}  ${r.route.padEnd(30)} ${String(r.n).padStart(5)} ${String(r.errors).padStart(4)} ${r.p50.toFixed(1).padStart(8)} ${r.p95.toFixed(1).padStart(8)} ${r.p99.toFixed(1).padStart(8)}`,
  );
  return [head, ...lines].join("\n");
}

const isMain = process.argv[1]?.endsWith("bench-load.ts");
if (isMain) {
  const seconds = Number(arg("seconds", "5"));
  const rates = arg("rates", "50,100,200")
    .split(",")
    .map(Number)
    .filter((n) => Number.isFinite(n) && n > 0);
  runLoadBench({ seconds, rates })
    .then((rows) => {
      console.log("Loopback load (mix of boards, scenarios, health; target p95 < 50 ms at 200 req/s)");
      console.log(formatLoadRows(rows));
    })
    .catch((err) => {
      console.error(err instanceof Error ? err.message : err);
      process.exit(1);
    });
}
