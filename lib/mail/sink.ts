// The local SMTP sink (DESIGN §7): a stand-in for the organisation's mail server that accepts
// every message and keeps it as an .eml file where tests and the admin mail page can read it.
// Development and tests only; it never relays anything.
import { randomBytes } from "node:crypto";
import { mkdir, rename, writeFile } from "node:fs/promises";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { SMTPServer, type SMTPServerDataStream } from "smtp-server";

export interface MailSink {
  /** the port actually bound (useful with port 0) */
  port: number;
  dir: string;
  close: () => Promise<void>;
}

const SINK_MAX_BYTES = 10 * 1024 * 1024;

/** File names sort by arrival: an ISO timestamp made file-name safe, then a random id. */
function sinkFileName(now = new Date()): string {
  return `${now.toISOString().replace(/[:.]/g, "-")}-${randomBytes(5).toString("hex")}.eml`;
}

async function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

export async function startMailSink({ port, dir, host = "127.0.0.1", maxBytes = SINK_MAX_BYTES }: { port: number; dir: string; host?: string; maxBytes?: number }): Promise<MailSink> {
  const folder = path.resolve(dir);
  await mkdir(folder, { recursive: true });
  const server = new SMTPServer({
    name: "pinchpoint-mail-sink",
    banner: "Pinchpoint local mail sink: messages are kept on disk, never delivered",
    secure: false,
    disabledCommands: ["STARTTLS"],
    // Any credentials are accepted, and none are needed: a configured SMTP URL with a user and
    // password works against the sink exactly as one without.
    authOptional: true,
    allowInsecureAuth: true,
    authMethods: ["PLAIN", "LOGIN"],
    onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? "sink" }),
    size: maxBytes,
    logger: false,
    onData(stream, _session, callback) {
      readAll(stream)
        .then(async (raw) => {
          if (stream.sizeExceeded) {
            const error = Object.assign(new Error(`Message exceeds the sink's limit of ${maxBytes} bytes`), { responseCode: 552 });
            return callback(error);
          }
          // Written under a temporary name then renamed, so a reader never sees half a message.
          const name = sinkFileName();
          const tmp = path.join(folder, `.${name}.tmp`);
          await writeFile(tmp, raw);
          await rename(tmp, path.join(folder, name));
          callback(null, `kept as ${name}`);
        })
        .catch((error: unknown) => callback(error instanceof Error ? error : new Error(String(error))));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  // Errors on single connections (a client hanging up) must not stop the sink.
  server.on("error", (error) => console.error("[mail-sink]", error.message));
  const bound = (server.server.address() as AddressInfo).port;
  return {
    port: bound,
    dir: folder,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
