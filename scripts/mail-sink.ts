// The local SMTP sink for `npm start` and `npm test` (DESIGN §7): 127.0.0.1:$PINCHPOINT_SMTP_PORT
// (2525), each message an .eml under $PINCHPOINT_MAIL_DIR (.data/mail). Never relays anything.
import { mailDir, sinkPort } from "../lib/mail/config";
import { startMailSink } from "../lib/mail/sink";

async function main() {
  const sink = await startMailSink({ port: sinkPort(), dir: mailDir() });
  console.error(`[mail-sink] listening on 127.0.0.1:${sink.port}, keeping messages in ${sink.dir}`);
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.on(signal, () => {
      // close() waits for open connections; do not let a stuck client keep the process alive.
      setTimeout(() => process.exit(0), 2_000).unref();
      void sink.close().then(() => process.exit(0));
    });
  }
}

main().catch((error: unknown) => {
  console.error("[mail-sink] could not start:", error instanceof Error ? error.message : error);
  process.exit(1);
});
