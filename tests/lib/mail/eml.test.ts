// The .eml reader against messages composed by nodemailer's own MailComposer (the library that
// writes what the sink receives), including non-ASCII headers and both transfer encodings.
import MailComposer from "nodemailer/lib/mail-composer";
import { describe, expect, it } from "vitest";
import { decodeQuotedPrintable, decodeWords, parseEml } from "@/lib/mail/eml";

const compose = (options: ConstructorParameters<typeof MailComposer>[0]) =>
  new Promise<Buffer>((resolve, reject) => new MailComposer(options).compile().build((err, msg) => (err ? reject(err) : resolve(msg))));

describe("parseEml", () => {
  it("reads headers, text and HTML of a multipart/alternative message", async () => {
    const raw = await compose({
      from: "Pinchpoint <pinchpoint@harbor-pantry.example>",
      to: ["checkout@harbor-pantry.example", "arch@harbor-pantry.example"],
      subject: "Größe → top ten: ümlauts and a long subject line that nodemailer will fold across several header lines for sure",
      text: `Plain body with ünïcode and a very long line ${"x".repeat(200)} end`,
      html: `<p style="color:#d9a441">HTML body — “quotes” ${"y".repeat(120)}</p>`,
      date: new Date("2030-05-06T07:08:09Z"),
    });
    const mail = parseEml(raw);
    expect(mail.from).toBe("Pinchpoint <pinchpoint@harbor-pantry.example>");
    expect(mail.to).toBe("checkout@harbor-pantry.example, arch@harbor-pantry.example");
    expect(mail.subject).toBe("Größe → top ten: ümlauts and a long subject line that nodemailer will fold across several header lines for sure");
    expect(mail.date?.toISOString()).toBe("2030-05-06T07:08:09.000Z");
    expect(mail.text).toBe(`Plain body with ünïcode and a very long line ${"x".repeat(200)} end`);
    expect(mail.html).toBe(`<p style="color:#d9a441">HTML body — “quotes” ${"y".repeat(120)}</p>`);
  });

  it("reads base64 bodies", async () => {
    const raw = await compose({ from: "a@example.com", to: "b@example.com", subject: "b64", text: "日本語のテキスト", textEncoding: "base64" });
    expect(parseEml(raw).text).toBe("日本語のテキスト");
    expect(parseEml(raw).html).toBeNull();
  });
});

describe("decoders", () => {
  it("decodes RFC 2047 encoded words (the examples of RFC 2047 §8)", () => {
    expect(decodeWords("=?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?= <keld@dkuug.dk>")).toBe("Keld Jørn Simonsen <keld@dkuug.dk>");
    expect(decodeWords("(=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)")).toBe("(ab)");
    expect(decodeWords("(=?ISO-8859-1?Q?a?= b)")).toBe("(a b)");
    expect(decodeWords("=?UTF-8?B?w7w=?=")).toBe("ü");
  });
  it("decodes quoted-printable soft breaks and octets (RFC 2045 §6.7)", () => {
    expect(decodeQuotedPrintable("a=3Db=\r\nc")).toBe("a=bc");
  });
});
