import { describe, expect, it } from "vitest";
import * as Comlink from "comlink";
import { SimCancelled, SimWorkerClient } from "@/lib/client/sim-client";
import { simWorkerApi } from "@/workers/sim.worker";
import { simulate } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

// SimWorkerClient against the real worker API, wired through a MessageChannel in place of a
// browser Worker (same structured-clone + transfer path that comlink uses in the browser).
function fakeWorkerFactory(stats: { spawned: number; terminated: number }) {
  return () => {
    const { port1, port2 } = new MessageChannel();
    Comlink.expose(simWorkerApi, port2);
    stats.spawned++;
    return Object.assign(port1, {
      terminate() {
        stats.terminated++;
        port1.close();
        port2.close();
      },
    }) as unknown as Worker;
  };
}

const s = scenario({
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 },
  input: { components: [{ kind: "triangle", amplitude: 2, frequency: 100 }] },
  run: { duration: 0.02, points: 501 },
});

describe("SimWorkerClient", () => {
  it("returns the same result as an in-process run, with Float64Array samples", async () => {
    const stats = { spawned: 0, terminated: 0 };
    const client = new SimWorkerClient(fakeWorkerFactory(stats));
    const seen: number[] = [];
    const r = await client.run(s, { onProgress: (f) => seen.push(f) });
    const local = simulate(s);
    expect(r.output).toBeInstanceOf(Float64Array);
    expect(Array.from(r.output)).toEqual(Array.from(local.output));
    expect(r.events).toEqual(local.events);
    expect(seen.at(-1)).toBe(1);
    client.dispose();
    expect(stats.terminated).toBe(1);
  });

  it("cancels through an AbortSignal: rejects with SimCancelled, terminates and respawns", async () => {
    const stats = { spawned: 0, terminated: 0 };
    const client = new SimWorkerClient(fakeWorkerFactory(stats));
    const ac = new AbortController();
    const pending = client.run(s, { signal: ac.signal });
    ac.abort();
    await expect(pending).rejects.toBeInstanceOf(SimCancelled);
    expect(stats.terminated).toBe(1);
    // next run spawns a fresh worker and works
    const r = await client.run(s);
    expect(stats.spawned).toBe(2);
    expect(r.events.length).toBeGreaterThan(0);
    await expect(client.run(s, { signal: AbortSignal.abort() })).rejects.toBeInstanceOf(SimCancelled);
    client.dispose();
  });

  it("rejects an invalid scenario with the field named", async () => {
    const client = new SimWorkerClient(fakeWorkerFactory({ spawned: 0, terminated: 0 }));
    const bad = { ...s, run: { ...s.run, points: 1 } };
    await expect(client.run(bad)).rejects.toThrow(/run\.points/);
    client.dispose();
  });
});
