// Inventory file format 1 (DESIGN §2) as zod schemas: the one definition the importer
// validates against and the JSON Schema served at GET /api/v1/schema/inventory is made from.
// Validation only, no transforms, so the JSON Schema says exactly what is accepted;
// defaults are applied by the importer after validation.
import { z } from "zod";
import { MAX_COMPONENTS, MAX_LABEL_LENGTH, MAX_NAME_LENGTH, MAX_URL_LENGTH } from "./limits";
import { COMPONENT_KINDS, KEY_PATTERN, SLUG_PATTERN, SOURCE_PATTERN, STRENGTHS } from "./types";

const FORMAT_VERSION = 1;

const show = (v: unknown): string => (typeof v === "string" ? JSON.stringify(v) : String(v));

export const ComponentKeySchema = z
  .string({ error: "a component key must be a string" })
  .regex(KEY_PATTERN, {
    error: (iss) =>
      `invalid key ${show(iss.input)}: keys are 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`,
  })
  .describe("Component key, unique in an environment");

const SlugSchema = (what: string) =>
  z.string({ error: `${what} must be a string` }).regex(SLUG_PATTERN, {
    error: (iss) =>
      `invalid ${what} ${show(iss.input)}: 1-63 characters of a-z, 0-9 and "-", starting with a letter or digit`,
  });

export const EnvironmentSlugSchema = SlugSchema("environment");
export const TeamSlugSchema = SlugSchema("team");

export const SourceSchema = z.string({ error: "source must be a string" }).regex(SOURCE_PATTERN, {
  error: (iss) =>
    `invalid source ${show(iss.input)}: 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`,
});

export const StrengthSchema = z
  .enum(STRENGTHS, {
    error: (iss) => `invalid strength ${show(iss.input)}: expected "hard", "soft" or "startup"`,
  })
  .describe("hard: down when unmet; soft: degraded when unmet; startup: needed only to start (boot order only)");

export const LabelSchema = (what: string) =>
  z
    .string({ error: `${what} must be a string` })
    .min(1, { error: `${what} must not be empty` })
    .max(MAX_LABEL_LENGTH, { error: `${what} is longer than ${MAX_LABEL_LENGTH} characters` });

export const KindSchema = z.enum(COMPONENT_KINDS, {
  error: (iss) =>
    iss.input === "undeclared"
      ? 'kind "undeclared" is reserved for placeholders Pinchpoint creates; declare a real kind'
      : `invalid kind ${show(iss.input)}: expected one of ${COMPONENT_KINDS.join(", ")}`,
});

export const TierSchema = z
  .int({ error: (iss) => `invalid tier ${show(iss.input)}: expected a whole number from 1 (most critical) to 4` })
  .min(1, { error: "tier must be from 1 (most critical) to 4" })
  .max(4, { error: "tier must be from 1 (most critical) to 4" });

export const ReplicasSchema = z
  .int({ error: (iss) => `invalid replicas ${show(iss.input)}: expected a whole number of at least 1` })
  .min(1, { error: "replicas must be at least 1" })
  .max(1_000_000, { error: "replicas must be at most 1000000" });

const HttpUrlSchema = z
  .url({
    protocol: /^https?$/,
    error: (iss) => `invalid link ${show(iss.input)}: links must be http:// or https:// URLs`,
  })
  .max(MAX_URL_LENGTH, { error: `a link is longer than ${MAX_URL_LENGTH} characters` });

const LinkNameSchema = z.string().regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/, {
  error: (iss) => `invalid link name ${show(iss.input)}: letters, digits, ".", "_" or "-", up to 64`,
});

const ViaSchema = LabelSchema("via").describe("Free protocol label, e.g. http, grpc, amqp");

/** `key` shorthand (a hard need), `{ key, strength?, via? }` or `{ any_of: [...], strength?, via? }`. */
const NeedKeySchema = z
  .object({ key: ComponentKeySchema, strength: StrengthSchema.optional(), via: ViaSchema.optional() })
  .strict();
const NeedAnyOfSchema = z
  .object({
    any_of: z
      .array(ComponentKeySchema, { error: "any_of must be a list of component keys" })
      .min(2, { error: "any_of needs at least two members (write a single need instead)" })
      .describe("Met while any one member is up"),
    strength: StrengthSchema.optional(),
    via: ViaSchema.optional(),
  })
  .strict();
const NeedEntrySchema = z.union([
  ComponentKeySchema.describe("Shorthand for a hard need on this key"),
  NeedKeySchema,
  NeedAnyOfSchema,
]);

/** Which branch of NeedEntrySchema an input was meant for, so a failed union reports that branch's issues. */
export function needBranch(input: unknown): 0 | 1 | 2 | null {
  if (typeof input === "string") return 0;
  if (typeof input !== "object" || input === null || Array.isArray(input)) return null;
  return "any_of" in input ? 2 : 1;
}

// Fields a component may take from `defaults`.
const sharedFields = {
  team: TeamSlugSchema.nullable().optional().describe("Owning team slug; absent or null = unowned"),
  tier: TierSchema.optional().describe("1 most critical … 4 least; default 3"),
  replicas: ReplicasSchema.optional().describe("Default 1"),
  zones: z.array(LabelSchema("zone"), { error: "zones must be a list" }).optional().describe("Failure domains it runs in"),
  tags: z.array(LabelSchema("tag"), { error: "tags must be a list" }).optional(),
  links: z
    .record(LinkNameSchema, HttpUrlSchema, { error: "links must be a mapping of name to URL" })
    .optional(),
};

const ComponentSchema = z
  .object({
    key: ComponentKeySchema,
    name: z
      .string({ error: "name must be a string" })
      .min(1, { error: "name must not be empty" })
      .max(MAX_NAME_LENGTH, { error: `name is longer than ${MAX_NAME_LENGTH} characters` })
      .optional()
      .describe("Display name; defaults to the key"),
    kind: KindSchema,
    aliases: z
      .array(ComponentKeySchema, { error: "aliases must be a list of names" })
      .optional()
      .describe("Other names it is known by (e.g. its service name in traces); unique across keys and aliases"),
    ...sharedFields,
    needs: z.array(NeedEntrySchema, { error: "needs must be a list" }).optional(),
  })
  .strict();

const DefaultsSchema = z
  .object(sharedFields)
  .strict()
  .describe("Merged into every component; a component's own fields win (links are merged name by name)");

export const InventoryFileSchema = z
  .object({
    pinchpoint: z.literal(FORMAT_VERSION, {
      error: (iss) =>
        iss.input === undefined
          ? "missing format version: start the file with `pinchpoint: 1`"
          : `unsupported format version ${show(iss.input)}: this server reads \`pinchpoint: ${FORMAT_VERSION}\``,
    }),
    source: SourceSchema.describe("Who declares these components, usually a repository"),
    environment: EnvironmentSlugSchema.optional().describe("If the push URL names one too, they must agree"),
    defaults: DefaultsSchema.optional(),
    components: z
      .array(ComponentSchema, { error: "components must be a list" })
      .max(MAX_COMPONENTS, { error: `at most ${MAX_COMPONENTS} components per file` }),
  })
  .strict()
  .describe("Pinchpoint inventory file, format 1");

export type InventoryFile = z.infer<typeof InventoryFileSchema>;
export type ComponentEntry = z.infer<typeof ComponentSchema>;
export type NeedEntry = z.infer<typeof NeedEntrySchema>;

/** JSON Schema (draft 2020-12) of format 1, generated from the zod schema above. */
export function inventoryJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(InventoryFileSchema, { target: "draft-2020-12", io: "input" });
  return { ...schema, title: "Pinchpoint inventory, format 1" };
}
