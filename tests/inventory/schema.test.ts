import { describe, expect, it } from "vitest";
import { InventoryFileSchema, inventoryJsonSchema } from "@/lib/inventory/schema";
import { MAX_COMPONENTS } from "@/lib/inventory/limits";

describe("format 1 JSON Schema", () => {
  const schema = inventoryJsonSchema() as {
    $schema: string;
    required: string[];
    additionalProperties: boolean;
    properties: Record<string, { const?: number; maxItems?: number; items?: { required?: string[]; additionalProperties?: boolean; properties?: Record<string, unknown> } }>;
  };

  it("is generated from the zod schema: draft 2020-12, strict objects, version const 1", () => {
    expect(schema.$schema).toBe("https://json-schema.org/draft/2020-12/schema");
    expect(schema.required.sort()).toEqual(["components", "pinchpoint", "source"]);
    expect(schema.additionalProperties).toBe(false);
    expect(schema.properties.pinchpoint?.const).toBe(1);
    expect(schema.properties.components?.maxItems).toBe(MAX_COMPONENTS);
    const component = schema.properties.components?.items;
    expect(component?.required?.sort()).toEqual(["key", "kind"]);
    expect(component?.additionalProperties).toBe(false);
    expect(Object.keys(component?.properties ?? {}).sort()).toEqual(["aliases", "key", "kind", "links", "name", "needs", "replicas", "tags", "team", "tier", "zones"]);
    expect(JSON.stringify(schema)).toContain("^[a-z0-9][a-z0-9._-]{0,127}$");
  });

  it("the zod schema accepts the three need forms and rejects a fourth", () => {
    const base = { pinchpoint: 1, source: "s", components: [{ key: "a", kind: "service", needs: ["b", { key: "c", strength: "soft" }, { any_of: ["d", "e"] }] }] };
    expect(InventoryFileSchema.safeParse(base).success).toBe(true);
    expect(InventoryFileSchema.safeParse({ ...base, components: [{ key: "a", kind: "service", needs: [{ all_of: ["d"] }] }] }).success).toBe(false);
  });
});
