// Requests about teams: create (admin), edit (admin, or a lead for contact fields), membership (admin).
import { z } from "zod";
import { slugSchema } from "./common";

/** Path words under /api/v1/teams that are routes of their own, so no team may take them as a slug. */
export const RESERVED_TEAM_SLUGS = ["unowned"] as const;

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .nullable()
    .optional()
    // An emptied form field means "none", not an empty string stored forever.
    .transform((v) => (v === "" ? null : v));

const emailSchema = z
  .string()
  .trim()
  .max(320)
  .nullable()
  .optional()
  .transform((v) => (v === "" ? null : v))
  .pipe(z.email("must be an e-mail address").nullable().optional());

export const createTeamSchema = z
  .object({
    slug: slugSchema.refine((s) => !(RESERVED_TEAM_SLUGS as readonly string[]).includes(s), { message: "this word is reserved by the API" }),
    name: z.string().trim().min(1, "give the team a name").max(200),
    email: emailSchema,
    oncall: optionalText(200),
    description: optionalText(2000),
  })
  .strict();
export type CreateTeamInput = z.infer<typeof createTeamSchema>;

/** Fields a lead of the team may change; `name` is admin-only (checked in the data layer). */
export const LEAD_EDITABLE = ["email", "oncall", "description"] as const;

export const updateTeamSchema = z
  .object({
    name: z.string().trim().min(1, "a team needs a name").max(200).optional(),
    email: emailSchema,
    oncall: optionalText(200),
    description: optionalText(2000),
  })
  .strict()
  .refine((b) => Object.values(b).some((v) => v !== undefined), { message: "send at least one field to change" });
export type UpdateTeamInput = z.infer<typeof updateTeamSchema>;

export const teamParamsSchema = z.object({ slug: slugSchema });

export const addMemberSchema = z
  .object({
    email: z.string().trim().toLowerCase().pipe(z.email("must be the e-mail address of an existing user")),
    lead: z.boolean().default(false),
  })
  .strict();
export type AddMemberInput = z.infer<typeof addMemberSchema>;

export const memberParamsSchema = z.object({ slug: slugSchema, userId: z.uuid() });

export const unownedQuerySchema = z.object({ environment: slugSchema.optional() }).strict();
