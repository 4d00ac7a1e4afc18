// Processes the end-to-end checks start as npm start would (app servers, workers run with tsx), the
// ports they take and the waiting for them: one set of children per test file, all stopped by stopAll.
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import path from "node:path";

export async function freePort(): Promise<number> {
  const s = createServer();
  await new Promise<void>((r) => s.listen(0, "127.0.0.1", () => r()));
  const { port } = s.address() as { port: number };
  await new Promise((r) => s.close(r));
  return port;
}

/** Polls `probe` every 250 ms until it gives a value; fails naming `what` after `timeoutMs`. */
export async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe().catch(() => null);
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

export class Children {
  private readonly started: ChildProcess[] = [];

  /** Runs `args` with the tsx of the checkout at `cwd`; output shown only with PINCHPOINT_E2E_VERBOSE. */
  startTsx({ name, cwd, args, env }: { name: string; cwd: string; args: string[]; env: NodeJS.ProcessEnv }): ChildProcess {
    const child = spawn(process.execPath, [path.join(cwd, "node_modules/tsx/dist/cli.mjs"), ...args], { cwd, env });
    const out = (chunk: Buffer) => {
      if (process.env.PINCHPOINT_E2E_VERBOSE) process.stderr.write(`[${name}] ${chunk}`);
    };
    child.stdout?.on("data", out);
    child.stderr?.on("data", out);
    this.started.push(child);
    return child;
  }

  /** SIGTERM to every child still running, then wait for each to exit. */
  async stopAll(): Promise<void> {
    for (const child of this.started) if (child.exitCode === null) child.kill("SIGTERM");
    await Promise.all(this.started.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r)))));
  }
}
