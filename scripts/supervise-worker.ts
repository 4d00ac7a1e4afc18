// npm start's analysis worker, kept running: restarted with a growing wait when it stops
// (scripts/lib/supervise.ts). The worker itself reports a heartbeat, so the overview and
// /api/health say when none has been seen for a minute even if this supervisor is gone too.
import path from "node:path";
import { supervise } from "./lib/supervise";

const root = path.resolve(__dirname, "..");
const supervisor = supervise({
  name: "analysis worker",
  command: process.execPath,
  // lib/data modules import "server-only", an empty module under the react-server condition.
  args: [path.join(root, "node_modules/tsx/dist/cli.mjs"), "--conditions=react-server", path.join(root, "scripts/analysis-worker.ts")],
});

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    void supervisor.stop().then(() => process.exit(0));
  });
}
