import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { parseCsvRecords } from "@/importers/csv/parse-csv";
import { expectIssues, expectOk, fixture, located } from "./helpers";

const csv = (body: string | Buffer, source: string | undefined = "edge-sheet") => importInventory({ format: "csv", body, source });

describe("CSV records (RFC 4180)", () => {
  // Quoting rules from RFC 4180 §2 items 5-7: quoted fields may hold commas, line breaks and "" for a quote.
  it("reads quoted commas, doubled quotes, line breaks inside quotes and CRLF", () => {
    const r = parseCsvRecords('a,"b,c","say ""hi"""\r\n"multi\nline",x,\r\nlast,y,z');
    expect(r.ok && r.records.map((rec) => rec.map((f) => f.value))).toEqual([
      ["a", "b,c", 'say "hi"'],
      ["multi\nline", "x", ""],
      ["last", "y", "z"],
    ]);
    // Line numbers after a quoted line break still match the file.
    expect(r.ok && r.records[2]?.[1]).toMatchObject({ line: 4, column: 6 });
  });

  it("locates an unterminated quote and text after a closing quote", () => {
    expect(parseCsvRecords('from,to\na,"b\n')).toEqual({ ok: false, line: 2, column: 3, message: "unterminated quoted field" });
    expect(parseCsvRecords('from,to\na,"b"c\n')).toMatchObject({ ok: false, line: 2, column: 6 });
    expect(parseCsvRecords('from,to\na,b"c\n')).toMatchObject({ ok: false, line: 2, column: 4 });
  });
});

describe("CSV importer", () => {
  it("header case-insensitive and trimmed; declares the from keys; blank rows skipped; repeats merged", () => {
    const inv = expectOk(csv(fixture("csv/edges.csv")));
    expect(inv.components.map((c) => c.key)).toEqual(["web-frontend", "api-gateway", "basket"]);
    expect(inv.components.every((c) => c.kind === "service" && c.tier === 3 && c.replicas === 1)).toBe(true);
    expect(inv.components.map((c) => c.needs.map((n) => n.type === "single" && `${n.key}:${n.strength}`))).toEqual([
      ["api-gateway:hard", "recommendations:soft"],
      ["session-store:hard", "basket:hard"],
      ["orders-db:hard"],
    ]);
    expect(inv.warnings).toEqual([located("lines[8]", 8, 1, /repeats line 7/)]);
  });

  it("CRLF and a BOM, two-column header", () => {
    const inv = expectOk(csv(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), fixture("csv/crlf.csv")])));
    expect(inv.components.map((c) => [c.key, c.needs.length])).toEqual([["web-frontend", 1], ["api-gateway", 1]]);
  });

  it("every bad row is reported with line and column", () => {
    expect(expectIssues(csv(fixture("csv/bad.csv")), 422)).toEqual([
      located("lines[2]", 2, 14, /depends on itself/),
      located("lines[3].to", 3, 13, /invalid key "Session Store"/),
      located("lines[4].strength", 4, 18, /invalid strength "mandatory"/),
      located("lines[5]", 5, 23, /4 fields; the header has 3/),
      located("lines[6].from", 6, 1, /empty from/),
    ]);
  });

  it("missing or unknown header columns, empty file, missing source", () => {
    expect(expectIssues(csv("source,target\na,b\n"), 422)).toEqual([
      located("header.source", 1, 1, /unknown column "source"/),
      located("header", 1, 1, /missing header column from/),
      located("header", 1, 1, /missing header column to/),
      located("header.target", 1, 8, /unknown column "target"/),
    ]);
    expect(expectIssues(csv("\n\n"), 422)).toEqual([located("", 1, 1, /the file is empty/)]);
    expect(expectIssues(csv("from,to\na,b\n", ""), 422)[0]).toMatchObject({ path: "source" });
  });

  it("binary garbage is refused as not text", () => {
    expect(expectIssues(csv(fixture("pinchpoint/bad/garbage.bin")), 422)[0]?.message).toMatch(/not UTF-8/);
  });
});
