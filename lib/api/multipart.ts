// Several files in one push: a `multipart/form-data` body (curl -F file=@compose.yaml -F file=@.env)
// read into named files in the order they were sent. The body is read with the inventory size limit
// first; the runtime's own form-data parser (the Fetch `Response.formData()`) then splits it, so no
// multipart parsing of our own.
import { AppError } from "@/lib/errors";
import type { ImportFile } from "@/lib/inventory/types";
import { readBodyWithLimit } from "./body";

export const isMultipart = (contentType: string | null): boolean => contentType !== null && /^multipart\/form-data\b/i.test(contentType);

export async function readPushedFiles(req: Request): Promise<ImportFile[]> {
  const contentType = req.headers.get("content-type") ?? "";
  const bytes = await readBodyWithLimit(req);
  let form: FormData;
  try {
    form = await new Response(new Uint8Array(bytes), { headers: { "content-type": contentType } }).formData();
  } catch {
    throw new AppError("bad_request", "The multipart body could not be read: send each file as a form part with a file name (curl -F file=@compose.yaml)");
  }
  const files: ImportFile[] = [];
  for (const [field, value] of form.entries()) {
    if (typeof value === "string") {
      throw new AppError("bad_request", `Form part "${field}" is not a file: send each file with a file name (curl -F file=@compose.yaml)`);
    }
    files.push({ name: value.name || field, body: new Uint8Array(await value.arrayBuffer()) });
  }
  if (files.length === 0) throw new AppError("bad_request", "The multipart body holds no files");
  const seen = new Set<string>();
  for (const f of files) {
    if (seen.has(f.name)) throw new AppError("bad_request", `Two files of the push are both named "${f.name}"`);
    seen.add(f.name);
  }
  return files;
}
