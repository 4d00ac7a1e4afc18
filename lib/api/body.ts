// Read a request body as bytes, refusing past the inventory size limit without buffering more.
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
