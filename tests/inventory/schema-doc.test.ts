// The format reference page is read from the JSON Schema (JSON Schema 2020-12, "properties",
// "required", "anyOf", "items": json-schema.org/draft/2020-12/json-schema-core §10.2–10.3).
import { describe, expect, it } from "vitest";
import { inventoryJsonSchema } from "@/lib/inventory/schema";
import { schemaSections } from "@/lib/inventory/schema-doc";

describe("format reference", () => {
  const sections = schemaSections(inventoryJsonSchema());
  const section = (p: string) => sections.find((s) => s.path === p);

  it("has a section for the file, its defaults, a component and each form of a need", () => {
    expect(sections.map((s) => s.path)).toEqual(["(the file)", "defaults", "components[]", "components[].needs[] (with key)", "components[].needs[] (with any_of)"]);
  });

  it("lists every property of a component with whether the schema requires it", () => {
    const c = section("components[]")!;
    expect(c.fields.map((f) => f.name)).toEqual(["key", "name", "kind", "aliases", "team", "tier", "replicas", "zones", "tags", "links", "needs"]);
    expect(c.fields.find((f) => f.name === "key")).toMatchObject({ required: true, limits: ["matches ^[a-z0-9][a-z0-9._-]{0,127}$"] });
    expect(c.fields.find((f) => f.name === "tier")).toMatchObject({ required: false, type: "whole number", limits: ["1–4"] });
    expect(c.fields.find((f) => f.name === "kind")?.type).toMatch(/^one of "service", "datastore"/);
  });

  it("says the format version is exactly 1", () => {
    expect(section("(the file)")!.fields.find((f) => f.name === "pinchpoint")).toMatchObject({ type: "exactly 1", required: true });
  });
});
