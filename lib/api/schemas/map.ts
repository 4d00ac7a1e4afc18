import { z } from "zod";
import { keySchema } from "./common";

const coordinate = z.number().finite().min(-1e7).max(1e7);

export const positionsSchema = z
  .record(keySchema, z.object({ x: coordinate, y: coordinate }).strict())
  .refine((p) => Object.keys(p).length <= 50_000, { message: "too many positions" });
