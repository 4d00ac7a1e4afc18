// The change-policies answer (GET and PUT /api/v1/environments/{env}/policies), parsed by the
// screen that edits them.
import { z } from "zod";
import { policySetSchema } from "@/lib/impact/policies";

export const policiesViewSchema = z.object({
  policies: policySetSchema,
  defaults: policySetSchema,
  custom: z.boolean(),
  updatedAt: z.string().nullable(),
});

export type PoliciesViewBody = z.infer<typeof policiesViewSchema>;
