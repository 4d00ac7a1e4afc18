// Keep a child process running: start it again when it exits, waiting longer after each quick
// failure (1 s, 2 s, 4 s … up to a minute) so a worker that crashes at start does not spin, and
// going back to the shortest wait once a run has lasted. A hand-written loop rather than a process
// manager package: it is a few lines, and npm start must not need anything installed system-wide.
import { spawn, type ChildProcess } from "node:child_process";

export interface SuperviseOptions {
  name: string;
  command: string;
  args: string[];
  env?: NodeJS.ProcessEnv;
  /** first wait before a restart; doubled after each run shorter than `healthyAfterMs` */
  minDelayMs?: number;
  maxDelayMs?: number;
  /** a run this long counts as healthy and resets the wait */
  healthyAfterMs?: number;
  log?: (line: string) => void;
  /** called with each restart's wait, for tests */
  onRestart?: (info: { code: number | null; signal: NodeJS.Signals | null; delayMs: number; restarts: number }) => void;
}

export interface Supervisor {
  /** the running child's pid, if any */
  pid(): number | undefined;
  restarts(): number;
  /** stop restarting, end the child (SIGTERM, then SIGKILL after `graceMs`) and wait for it */
  stop(graceMs?: number): Promise<void>;
}

export function supervise(opts: SuperviseOptions): Supervisor {
  const minDelay = opts.minDelayMs ?? 1_000;
  const maxDelay = opts.maxDelayMs ?? 60_000;
  const healthyAfter = opts.healthyAfterMs ?? 60_000;
  const log = opts.log ?? ((line: string) => console.error(line));
  let child: ChildProcess | undefined;
  let stopping = false;
  let delay = 0;
  let restarts = 0;
  let timer: NodeJS.Timeout | undefined;
  let exited: Promise<void> = Promise.resolve();

  const start = () => {
    const startedAt = Date.now();
    const proc = spawn(opts.command, opts.args, { stdio: "inherit", env: opts.env ?? process.env });
    child = proc;
    exited = new Promise((resolve) => {
      proc.once("error", (error) => log(`[supervisor] could not start ${opts.name}: ${error.message}`));
      proc.once("exit", (code, signal) => {
        child = undefined;
        resolve();
        if (stopping) return;
        const ranMs = Date.now() - startedAt;
        delay = ranMs >= healthyAfter || delay === 0 ? minDelay : Math.min(maxDelay, delay * 2);
        restarts++;
        log(`[supervisor] ${opts.name} exited (${signal ?? `code ${code}`}) after ${Math.round(ranMs / 1000)} s; starting it again in ${Math.round(delay / 100) / 10} s`);
        opts.onRestart?.({ code, signal, delayMs: delay, restarts });
        timer = setTimeout(start, delay);
      });
    });
  };
  start();

  return {
    pid: () => child?.pid,
    restarts: () => restarts,
    async stop(graceMs = 10_000) {
      stopping = true;
      if (timer) clearTimeout(timer);
      const running = child;
      if (!running) return;
      running.kill("SIGTERM");
      const kill = setTimeout(() => running.kill("SIGKILL"), graceMs);
      await exited;
      clearTimeout(kill);
    },
  };
}
