// Requests about teams: create (admin), edit (admin, or a lead for contact fields), membership (admin).
import { z } from "zod";
import { defineList, kindSchema, listQuery, pageOf, slugSchema, tierSchema } from "./common";

/** Path words under /api/v1/teams that are routes of their own, so no team may take them as a slug. */
const RESERVED_TEAM_SLUGS = ["unowned"] as const;

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

/** A team's components across environments, and the unowned queue: both grow with the estate. */
export const OWNED_LIST = defineList({
  sorts: { pinchScore: "desc", key: "asc", environment: "asc", tier: "asc", kind: "asc" },
  defaultSort: "pinchScore",
  defaultLimit: 50,
  maxLimit: 500,
});
const ownedFilters = {
  environment: slugSchema.optional(),
  /** part of the key or the name */
  q: z.string().max(128).optional(),
};
export const unownedQuerySchema = listQuery(OWNED_LIST).extend(ownedFilters).strict();
export const teamQuerySchema = listQuery(OWNED_LIST).extend(ownedFilters).strict();
export type TeamQuery = z.infer<typeof teamQuerySchema>;

// ---------------------------------------------------------------------------------------------
// Responses

export const teamRecordSchema = z.object({ slug: z.string(), name: z.string(), email: z.string().nullable(), oncall: z.string().nullable(), description: z.string().nullable() });

const teamOverviewSchema = teamRecordSchema.extend({
  memberCount: z.int(),
  leadCount: z.int(),
  /** components it owns (assigned in Pinchpoint, else declared), over every environment */
  componentCount: z.int(),
  pinchPointCount: z.int(),
});
export type TeamOverview = z.infer<typeof teamOverviewSchema>;

/** GET /teams. */
export const teamsResponseSchema = z.object({ items: z.array(teamOverviewSchema), unownedCount: z.int() });

export const teamMemberSchema = z.object({ userId: z.string(), name: z.string(), email: z.string(), role: z.string(), isLead: z.boolean() });
export type TeamMember = z.infer<typeof teamMemberSchema>;

/** DELETE /teams/{slug}/members/{userId}. */
export const memberRemovedSchema = z.object({ removed: z.literal(true) });

const teamComponentSchema = z.object({
  environment: z.string(),
  key: z.string(),
  name: z.string(),
  kind: kindSchema,
  tier: tierSchema,
  /** null until its environment's served snapshot has been analysed with it */
  pinchScore: z.number().nullable(),
  /** place by betweenness (the default ranking) */
  rank: z.int().nullable(),
  /** place by pinch score in its environment */
  pinchRank: z.int().nullable(),
  pinchPoint: z.boolean(),
});
export type TeamComponent = z.infer<typeof teamComponentSchema>;

/** GET /teams/{slug}: members, contact, its pinch points, and one page of its components. */
export const teamDetailSchema = teamRecordSchema.extend({
  id: z.string(),
  members: z.array(teamMemberSchema),
  pinchPoints: z.array(teamComponentSchema),
  components: pageOf(teamComponentSchema),
});
export type TeamDetail = z.infer<typeof teamDetailSchema>;

/** GET /teams/unowned. */
export const unownedResponseSchema = pageOf(teamComponentSchema);
export type UnownedComponent = TeamComponent;
