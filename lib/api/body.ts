// Read a request body as bytes, refusing past the inventory size limit without buffering more.
import { Readable } from "node:stream";
import type { ReadableStream as NodeReadableStream } from "node:stream/web";
import { createGunzip } from "node:zlib";
import { AppError } from "@/lib/errors";
import { MAX_BODY_BYTES } from "@/lib/inventory/limits";

const tooLarge = (limit: number) =>
  new AppError("payload_too_large", `The body is over the limit of ${Math.round((limit / 1024 / 1024) * 10) / 10} MiB`, [
    { path: "(body)", message: `at most ${limit} bytes are accepted here` },
  ]);

export async function readBodyWithLimit(req: Request, limit = MAX_BODY_BYTES): Promise<Buffer> {
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > limit) throw tooLarge(limit);
  if (!req.body) return Buffer.alloc(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel();
      throw tooLarge(limit);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks);
}

/**
 * A request body as a stream of chunks, gunzipped when sent with `Content-Encoding: gzip`, for
 * readers that fold as they go (trace files) and so take bodies larger than any buffer limit.
 */
export async function* bodyChunks(req: Request): AsyncGenerator<Uint8Array> {
  if (!req.body) return;
  const coding = (req.headers.get("content-encoding") ?? "").trim().toLowerCase();
  if (coding !== "" && coding !== "identity" && coding !== "gzip") {
    throw new AppError("invalid_request", `Content-Encoding ${JSON.stringify(coding)} is not supported; send gzip or no encoding`);
  }
  const source = Readable.fromWeb(req.body as NodeReadableStream<Uint8Array>);
  const stream = coding === "gzip" ? source.pipe(createGunzip()) : source;
  try {
    for await (const chunk of stream) yield chunk as Uint8Array;
  } catch (error) {
    if ((error as { code?: string }).code?.startsWith("Z_")) throw new AppError("invalid_inventory", "The body is not valid gzip", [{ path: "(body)", message: "Content-Encoding: gzip, but the body does not decompress" }]);
    throw error;
  } finally {
    source.destroy();
  }
}
