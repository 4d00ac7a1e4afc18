// A JSON answer checked against its response schema by the compiler: the body a route hands over
// must have the shape lib/api/schemas says the route answers (what openapi.json documents and the
// screens parse). Checked at compile time only, so answers cost nothing more to send; the
// response-schemas integration test parses real answers with the same schemas.
import { NextResponse } from "next/server";
import type { z } from "zod";

export function respond<S extends z.ZodType>(_schema: S, body: z.input<S>, init?: ResponseInit): NextResponse {
  return NextResponse.json(body, init);
}
