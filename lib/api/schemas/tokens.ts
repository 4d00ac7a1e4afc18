import { z } from "zod";
import { TOKEN_SCOPES } from "@/lib/auth/roles";
import { slugSchema } from "./common";
import { SOURCE_PATTERN } from "@/lib/inventory/types";

export const createTokenSchema = z
  .object({
    name: z.string().trim().min(1, "give the token a name people will recognise").max(100),
    scopes: z.array(z.enum(TOKEN_SCOPES)).min(1, "a token needs at least one scope"),
    environment: slugSchema.optional(),
    source: z.string().regex(SOURCE_PATTERN, "must be a source name").optional(),
  })
  .strict();
export type CreateTokenInput = z.infer<typeof createTokenSchema>;

export const tokenParamsSchema = z.object({ id: z.uuid() });
