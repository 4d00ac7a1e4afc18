// The worker supervisor (npm start): a stopped worker is started again, the wait doubles after each
// quick failure up to the cap, and stopping the supervisor ends the child. The doubling is the
// common practice of exponential backoff; the values here are the options given, not timings.
import { describe, expect, it } from "vitest";
import { supervise } from "@/scripts/lib/supervise";

const quiet = () => undefined;

describe("supervise", () => {
  it("restarts a child that keeps exiting, waiting 1×, 2×, 4× … the first delay up to the cap", async () => {
    const delays: number[] = [];
    let done!: () => void;
    const enough = new Promise<void>((r) => (done = r));
    const s = supervise({
      name: "crasher",
      command: process.execPath,
      args: ["-e", "process.exit(3)"],
      minDelayMs: 5,
      maxDelayMs: 20,
      healthyAfterMs: 60_000,
      log: quiet,
      onRestart: ({ delayMs, code }) => {
        expect(code).toBe(3);
        delays.push(delayMs);
        if (delays.length === 5) done();
      },
    });
    await enough;
    await s.stop();
    expect(delays).toEqual([5, 10, 20, 20, 20]);
    expect(s.restarts()).toBeGreaterThanOrEqual(5);
  });

  it("goes back to the shortest wait after a run that lasted", async () => {
    const delays: number[] = [];
    let done!: () => void;
    const enough = new Promise<void>((r) => (done = r));
    const s = supervise({
      name: "steady",
      command: process.execPath,
      args: ["-e", "process.exit(1)"],
      minDelayMs: 5,
      healthyAfterMs: 0,
      log: quiet,
      onRestart: ({ delayMs }) => {
        delays.push(delayMs);
        if (delays.length === 3) done();
      },
    });
    await enough;
    await s.stop();
    expect(delays).toEqual([5, 5, 5]);
  });

  it("starts a killed child again, and stop() ends it without a restart", async () => {
    let restarted!: () => void;
    const back = new Promise<void>((r) => (restarted = r));
    const s = supervise({ name: "sleeper", command: process.execPath, args: ["-e", "setInterval(() => {}, 1000)"], minDelayMs: 5, log: quiet, onRestart: () => restarted() });
    await new Promise((r) => setTimeout(r, 100));
    const first = s.pid();
    expect(first).toBeGreaterThan(0);
    process.kill(first!, "SIGKILL");
    await back;
    await new Promise((r) => setTimeout(r, 100));
    expect(s.pid()).toBeGreaterThan(0);
    expect(s.pid()).not.toBe(first);
    const last = s.pid()!;
    await s.stop();
    expect(s.pid()).toBeUndefined();
    expect(() => process.kill(last, 0)).toThrow();
    expect(s.restarts()).toBe(1);
  });
});
