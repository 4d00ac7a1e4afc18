// The part of the Compose Specification this importer reads. Loose objects: a Compose file
// has many fields we have no use for, and it is someone else's format, so they are not errors.
import { z } from "zod";

export const DEPENDS_ON_CONDITIONS = ["service_started", "service_healthy", "service_completed_successfully"] as const;

const ServiceNameSchema = z.string({ error: "a service name must be a string" }).min(1, { error: "empty service name" });

export const DependsOnSchema = z.union([
  z.array(ServiceNameSchema),
  z.record(
    z.string(),
    z.looseObject({
      condition: z
        .enum(DEPENDS_ON_CONDITIONS, {
          error: (iss) => `invalid condition ${JSON.stringify(iss.input)}: expected one of ${DEPENDS_ON_CONDITIONS.join(", ")}`,
        })
        .optional(),
      required: z.boolean({ error: "required must be true or false" }).optional(),
      restart: z.boolean({ error: "restart must be true or false" }).optional(),
    }),
  ),
]);

export const ComposeServiceSchema = z.looseObject({
  depends_on: DependsOnSchema.optional(),
  links: z.array(z.string({ error: "a link must be a string like \"db\" or \"db:alias\"" })).optional(),
  deploy: z.looseObject({ replicas: z.int().min(0).optional() }).nullable().optional(),
});

export const ComposeFileSchema = z.looseObject({
  services: z.record(z.string(), ComposeServiceSchema.nullable(), { error: "services must be a mapping of service name to service" }),
});

export type ComposeFile = z.infer<typeof ComposeFileSchema>;

/** Which branch of DependsOnSchema an input was meant for. */
export function dependsOnBranch(input: unknown): 0 | 1 | null {
  if (Array.isArray(input)) return 0;
  return typeof input === "object" && input !== null ? 1 : null;
}
