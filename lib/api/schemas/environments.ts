// Requests of environment management (admin): create, rename, delete with a typed confirmation.
import { z } from "zod";
import { slugSchema } from "./common";

const nameSchema = z.string().trim().min(1, "give the environment a name people will recognise").max(200, "at most 200 characters");

export const createEnvironmentSchema = z
  .object({
    slug: slugSchema,
    name: nameSchema.optional(),
  })
  .strict();
export type CreateEnvironmentInput = z.infer<typeof createEnvironmentSchema>;

/** Only the display name changes: the slug is in every URL, token binding and CI job. */
export const renameEnvironmentSchema = z.object({ name: nameSchema }).strict();
export type RenameEnvironmentInput = z.infer<typeof renameEnvironmentSchema>;

/** `?confirm=<slug>`: the caller types the slug again, so a stray DELETE cannot wipe a graph. */
export const deleteEnvironmentQuerySchema = z.object({
  confirm: z.string({ error: "repeat the environment's slug in ?confirm= to delete it" }).min(1, "repeat the environment's slug in ?confirm= to delete it"),
});
