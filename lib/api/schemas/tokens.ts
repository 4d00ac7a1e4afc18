// API tokens (admin): create with scopes and bindings, list, revoke.
import { z } from "zod";
import { TOKEN_SCOPES } from "@/lib/auth/roles";
import { instantSchema, slugSchema, sourceSchema } from "./common";

export const createTokenSchema = z
  .object({
    name: z.string().trim().min(1, "give the token a name people will recognise").max(100),
    scopes: z.array(z.enum(TOKEN_SCOPES)).min(1, "a token needs at least one scope"),
    environment: slugSchema.optional(),
    source: sourceSchema.optional(),
  })
  .strict();
export type CreateTokenInput = z.infer<typeof createTokenSchema>;

export const tokenParamsSchema = z.object({ id: z.uuid() });

// ---------------------------------------------------------------------------------------------
// Responses

export const tokenInfoSchema = z.object({
  id: z.string(),
  name: z.string(),
  /** the first characters of the secret, to tell tokens apart */
  prefix: z.string(),
  scopes: z.array(z.enum(TOKEN_SCOPES)),
  environment: z.string().nullable(),
  source: z.string().nullable(),
  createdBy: z.string().nullable(),
  /** the creator's e-mail (null when the account is gone) */
  createdByEmail: z.string().nullable(),
  createdAt: instantSchema,
  lastUsedAt: instantSchema.nullable(),
  revokedAt: instantSchema.nullable(),
});
export type TokenInfo = z.infer<typeof tokenInfoSchema>;

/** GET /tokens. */
export const tokensResponseSchema = z.object({ items: z.array(tokenInfoSchema) });

/** POST /tokens: the secret is in this answer and never again. */
export const createdTokenSchema = tokenInfoSchema.extend({ token: z.string() });
export type CreatedToken = z.infer<typeof createdTokenSchema>;
