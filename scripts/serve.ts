// The app's HTTP server (npm start, npm run dev, the end-to-end tests): Next.js behind a plain Node
// server that owns the socket. Next reads the caller's address from X-Forwarded-For and only fills
// that header in when the client left it out, so a made-up header would choose the address the
// sign-in limit counts against. Here the address comes from the socket (or from the trusted proxies'
// entries, PINCHPOINT_TRUSTED_PROXY_HOPS) and replaces whatever the client sent.
//   tsx scripts/serve.ts [--dev] [-H host] [-p port]
import { createServer, type IncomingMessage } from "node:http";
import next from "next";
import { clientAddress, trustedProxyHops } from "../lib/auth/client-address";

const args = process.argv.slice(2);
const option = (short: string, fallback: string): string => {
  const i = args.indexOf(short);
  return i >= 0 && args[i + 1] ? args[i + 1]! : fallback;
};
const dev = args.includes("--dev");
const hostname = option("-H", process.env.PINCHPOINT_HOST ?? "127.0.0.1");
const port = Number(option("-p", process.env.PORT ?? "3000"));
const hops = trustedProxyHops();

function rewriteForwarded(req: IncomingMessage): void {
  req.headers["x-forwarded-for"] = clientAddress({ peer: req.socket.remoteAddress, forwardedFor: req.headers["x-forwarded-for"], hops });
  delete req.headers["x-real-ip"];
  // With no proxy of ours in front, the scheme and host are those of this connection, not the client's word.
  if (hops === 0) {
    delete req.headers["x-forwarded-proto"];
    delete req.headers["x-forwarded-host"];
    delete req.headers["x-forwarded-port"];
  }
}

async function main(): Promise<void> {
  const app = next({ dev, hostname, port, dir: process.cwd() });
  const handle = app.getRequestHandler();
  await app.prepare();
  const server = createServer((req, res) => {
    rewriteForwarded(req);
    void handle(req, res);
  });
  server.on("error", (error: NodeJS.ErrnoException) => {
    if (error.code === "EADDRINUSE") console.error(`[serve] port ${port} on ${hostname} is taken by another process; choose another with PORT`);
    else console.error("[serve] could not listen:", error.message);
    process.exit(1);
  });
  server.listen(port, hostname, () => console.log(`[serve] Pinchpoint on http://${hostname}:${port}${dev ? " (development)" : ""}, trusted proxy hops: ${hops}`));
  const stop = () => {
    server.close(() => void app.close().finally(() => process.exit(0)));
    // Open keep-alive connections would hold close() up; they are ours to end.
    server.closeAllConnections();
    setTimeout(() => process.exit(0), 5_000).unref();
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}

main().catch((error: unknown) => {
  console.error("[serve] stopped:", error);
  process.exit(1);
});
