// The part of the Compose Specification this importer reads, checked file by file before the files
// are merged (an override file holds fragments, so every field is optional). Loose objects: a
// Compose file has many fields we have no use for, and it is someone else's format, so they are
// not errors. Our own extension field, `x-pinchpoint`, is strict: a typo there is an error.
import { z } from "zod";
import {
  ComponentKeySchema,
  KindSchema,
  LabelSchema,
  ReplicasSchema,
  SourceSchema,
  StrengthSchema,
  TeamSlugSchema,
  TierSchema,
} from "@/lib/inventory/schema";

const DEPENDS_ON_CONDITIONS = ["service_started", "service_healthy", "service_completed_successfully"] as const;

const ServiceNameSchema = z.string({ error: "a service name must be a string" }).min(1, { error: "empty service name" });

const DependsOnSchema = z.union([
  z.array(ServiceNameSchema),
  z.record(
    z.string(),
    z
      .looseObject({
        condition: z
          .enum(DEPENDS_ON_CONDITIONS, {
            error: (iss) => `invalid condition ${JSON.stringify(iss.input)}: expected one of ${DEPENDS_ON_CONDITIONS.join(", ")}`,
          })
          .optional(),
        required: z.boolean({ error: "required must be true or false" }).optional(),
        restart: z.boolean({ error: "restart must be true or false" }).optional(),
      })
      .nullable(),
  ),
], { error: "depends_on must be a list of service names or a mapping of service name to { condition, required }" });

const Scalar = z.union([z.string(), z.number(), z.boolean(), z.null()]);
const EnvironmentSchema = z.union(
  [z.array(z.string({ error: "an environment entry must be a string like NAME=value" })), z.record(z.string(), Scalar)],
  { error: "environment must be a list of NAME=value or a mapping of name to value" },
);
const CommandSchema = z.union([z.string(), z.array(z.string({ error: "each part of a command must be a string" })), z.null()], {
  error: "must be a string or a list of strings",
});
const EnvFileSchema = z.union(
  [
    z.string(),
    z.array(
      z.union([
        z.string(),
        z.looseObject({ path: z.string({ error: "env_file path must be a string" }), required: z.boolean({ error: "required must be true or false" }).optional() }),
      ]),
    ),
  ],
  { error: "env_file must be a path or a list of paths" },
);

const NeedStrengthSchema = z.union([StrengthSchema, z.strictObject({ strength: StrengthSchema.optional(), via: LabelSchema("via").optional() })]);
const AnyOfSchema = z.union([
  z.array(ComponentKeySchema, { error: "an any_of group is a list of at least two names" }).min(2, { error: "an any_of group needs at least two members" }),
  z.strictObject({
    members: z.array(ComponentKeySchema).min(2, { error: "an any_of group needs at least two members" }),
    strength: StrengthSchema.optional(),
    via: LabelSchema("via").optional(),
  }),
]);

/** `x-pinchpoint` on a service: what Compose cannot say about it. */
const ServiceExtensionSchema = z
  .strictObject(
    {
      name: LabelSchema("name").optional(),
      kind: KindSchema.optional(),
      team: TeamSlugSchema.nullable().optional(),
      tier: TierSchema.optional(),
      replicas: ReplicasSchema.optional(),
      zones: z.array(LabelSchema("zone"), { error: "zones must be a list" }).optional(),
      tags: z.array(LabelSchema("tag"), { error: "tags must be a list" }).optional(),
      aliases: z.array(ComponentKeySchema, { error: "aliases must be a list of names" }).optional(),
      needs: z
        .record(z.string(), NeedStrengthSchema, { error: "needs must be a mapping of service name to hard, soft or startup" })
        .optional(),
      any_of: z.array(AnyOfSchema, { error: "any_of must be a list of groups" }).optional(),
    },
    { error: "x-pinchpoint must be a mapping" },
  )
  .nullable();

/** `x-pinchpoint` at the top of the file: who declares the project and who owns it by default. */
const ProjectExtensionSchema = z
  .strictObject({ source: SourceSchema.optional(), team: TeamSlugSchema.nullable().optional() }, { error: "x-pinchpoint must be a mapping" })
  .nullable();

const ComposeServiceSchema = z.looseObject({
  image: z.string({ error: "image must be a string" }).optional(),
  depends_on: DependsOnSchema.optional(),
  links: z.array(z.string({ error: 'a link must be a string like "db" or "db:alias"' })).optional(),
  network_mode: z.string({ error: 'network_mode must be a string like "service:vpn"' }).optional(),
  volumes_from: z.array(z.string({ error: 'a volumes_from entry must be a string like "storage" or "storage:ro"' })).optional(),
  environment: EnvironmentSchema.optional(),
  env_file: EnvFileSchema.optional(),
  command: CommandSchema.optional(),
  entrypoint: CommandSchema.optional(),
  profiles: z.array(z.string({ error: "a profile must be a string" }), { error: "profiles must be a list" }).optional(),
  extends: z
    .union([z.string(), z.looseObject({ service: z.string({ error: "extends needs a service name" }), file: z.string({ error: "extends file must be a path" }).optional() })], {
      error: "extends must be a service name or a mapping with service and an optional file",
    })
    .optional(),
  scale: z.int({ error: "scale must be a whole number" }).min(0, { error: "scale must be 0 or more" }).optional(),
  deploy: z.looseObject({ replicas: z.int({ error: "replicas must be a whole number" }).min(0).optional() }).nullable().optional(),
  "x-pinchpoint": ServiceExtensionSchema.optional(),
});

const IncludeSchema = z.array(
  z.union([
    z.string(),
    z.looseObject({
      path: z.union([z.string(), z.array(z.string())], { error: "include path must be a path or a list of paths" }),
      env_file: z.union([z.string(), z.array(z.string())]).optional(),
    }),
  ]),
  { error: "include must be a list" },
);

export const ComposeFileSchema = z.looseObject({
  services: z.record(z.string(), ComposeServiceSchema.nullable(), { error: "services must be a mapping of service name to service" }).nullable().optional(),
  include: IncludeSchema.nullable().optional(),
  "x-pinchpoint": ProjectExtensionSchema.optional(),
});

export type ServiceExtension = NonNullable<z.infer<typeof ServiceExtensionSchema>>;
export type ProjectExtension = NonNullable<z.infer<typeof ProjectExtensionSchema>>;
