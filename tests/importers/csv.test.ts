import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { parseCsvRecords } from "@/importers/csv/parse-csv";
import { expectIssues, expectOk, fixture, located } from "./helpers";

// Quoting from RFC 4180 §2; the rest (aliases, sniffing, comments) is this importer's own contract, importers/csv/index.ts.
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

  it("missing header columns, empty file, missing source", () => {
    expect(expectIssues(csv("caller,weight\na,b\n"), 422)).toEqual([located("header", 1, 1, /missing header column to: the first row must name the columns.*target, callee, provider or dependency/)]);
    expect(expectIssues(csv("\n\n"), 422)).toEqual([located("", 1, 1, /the file is empty/)]);
    expect(expectIssues(csv("# only a comment\n"), 422)).toEqual([located("", 1, 1, /the file is empty/)]);
    expect(expectIssues(csv("from,to\na,b\n", ""), 422)[0]).toMatchObject({ path: "source" });
  });

  it("header aliases; extra known columns; unknown columns ignored with one warning", () => {
    const inv = expectOk(csv("Caller,Provider,Kind,Tier,Team,Via,Notes,Owner\ncheckout,payments,service,1,checkout,grpc,x,y\npayments,,datastore,2,payments,,,\n"));
    expect(inv.components).toEqual([
      expect.objectContaining({ key: "checkout", kind: "service", tier: 1, team: "checkout", needs: [{ type: "single", key: "payments", strength: "hard", via: "grpc" }] }),
      expect.objectContaining({ key: "payments", kind: "datastore", tier: 2, team: "payments", needs: [] }),
    ]);
    expect(inv.warnings).toEqual([located("header", 1, 1, /columns "Notes", "Owner" are not read and were ignored; the columns read are from, to, strength, kind, tier, team, via, any_of/)]);
  });

  it("an empty to declares a leaf; required/optional/startup strengths; any_of groups by label", () => {
    const inv = expectOk(csv("source,target,strength,any_of\nweb,api,required,\nweb,recs,optional,\nweb,schema-job,startup,\nweb,search-a,,s\nweb,search-b,soft,s\nsearch-a,,,\n"));
    expect(inv.components.map((c) => [c.key, c.needs])).toEqual([
      ["web", [
        { type: "single", key: "api", strength: "hard", via: null },
        { type: "single", key: "recs", strength: "soft", via: null },
        { type: "single", key: "schema-job", strength: "startup", via: null },
        { type: "any_of", keys: ["search-a", "search-b"], strength: "hard", via: null },
      ]],
      ["search-a", []],
    ]);
    expect(expectIssues(csv("from,to,any_of\nweb,a,g\n"), 422)).toEqual([located("lines[2].any_of", 2, 7, /any_of group "g" of web has one member/)]);
  });

  it("delimiter sniffed among comma, semicolon and tab; # lines are comments", () => {
    for (const sep of [";", "\t"]) {
      const inv = expectOk(csv(`# exported from the estate sheet\nfrom${sep}to${sep}strength\n# a comment between rows\n"web"${sep}"api"${sep}soft\nweb${sep}db${sep}\n`));
      expect(inv.components[0]?.needs.map((n) => n.type === "single" && [n.key, n.strength])).toEqual([["api", "soft"], ["db", "hard"]]);
    }
  });

  it("keys are lower-cased; two spellings of one key are merged with one warning each", () => {
    const inv = expectOk(csv("from,to\nCheckout,Payments\ncheckout,payments\nCHECKOUT,orders\n"));
    expect(inv.components.map((c) => [c.key, c.name, c.needs.length])).toEqual([["checkout", "Checkout", 2]]);
    expect(inv.warnings.map((w) => w.message)).toEqual([
      expect.stringMatching(/"checkout" and "Checkout" \(line 2\) are one key, "checkout"/),
      expect.stringMatching(/"payments" and "Payments" \(line 2\) are one key/),
      expect.stringMatching(/checkout → payments repeats line 2/),
      expect.stringMatching(/"CHECKOUT" and "Checkout" \(line 2\) are one key/),
    ]);
  });

  it("binary garbage is refused as not text", () => {
    expect(expectIssues(csv(fixture("pinchpoint/bad/garbage.bin")), 422)[0]?.message).toMatch(/not UTF-8/);
  });
});
