// Requests of the admin user routes and the invite acceptance route.
import { z } from "zod";
import { ROLES } from "@/lib/auth/roles";
import { instantSchema } from "./common";

const roleSchema = z.enum(ROLES);

export const inviteUserSchema = z
  .object({
    email: z.email("must be an e-mail address").max(320).transform((e) => e.trim().toLowerCase()),
    name: z.string().trim().min(1, "give the person's name").max(200),
    role: roleSchema,
  })
  .strict();
export type InviteUserInput = z.infer<typeof inviteUserSchema>;

export const updateUserSchema = z
  .object({
    role: roleSchema.optional(),
    active: z.boolean().optional(),
  })
  .strict()
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: "change the role, the active flag, or both" });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

export const userParamsSchema = z.object({ id: z.uuid() });

/** base64url of 32 random bytes is 43 characters; anything else cannot be one of ours. */
export const inviteTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/);
export const inviteParamsSchema = z.object({ token: inviteTokenSchema });

export const MIN_PASSWORD_LENGTH = 12;
export const acceptInviteSchema = z
  .object({
    password: z
      .string()
      .min(MIN_PASSWORD_LENGTH, `use at least ${MIN_PASSWORD_LENGTH} characters`)
      .max(200, "at most 200 characters"),
  })
  .strict();
export type AcceptInviteInput = z.infer<typeof acceptInviteSchema>;

// ---------------------------------------------------------------------------------------------
// Responses

export const adminUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
  createdAt: instantSchema,
  /** `invited`: no password yet and an open link; `invite-expired`: no password and every link has lapsed */
  status: z.enum(["active", "invited", "invite-expired", "deactivated"]),
  inviteExpiresAt: instantSchema.nullable(),
});
export type AdminUser = z.infer<typeof adminUserSchema>;

/** GET /users. */
export const usersResponseSchema = z.object({ items: z.array(adminUserSchema) });

/** POST /users and /users/{id}/invite: the one-time link (shown once). */
export const inviteResultSchema = z.object({ user: adminUserSchema, token: z.string(), url: z.string(), expiresAt: instantSchema });
export type InviteResult = z.infer<typeof inviteResultSchema>;

/** POST /invites/{token}. */
export const acceptedInviteSchema = z.object({ email: z.string() });

/** The sign-in form's fields (next-auth's credentials provider checks them again). */
export const signInSchema = z.object({
  email: z.email("enter the e-mail address you were invited with"),
  password: z.string().min(1, "enter your password"),
});
