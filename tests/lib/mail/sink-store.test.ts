// Reading kept messages (mailparser) against messages composed by nodemailer's own MailComposer
// (the library that writes what the sink receives): non-ASCII headers, folded lines, both transfer
// encodings; and RFC 2047's own examples of encoded words.
import MailComposer from "nodemailer/lib/mail-composer";
import { describe, expect, it } from "vitest";
import { parseMessage } from "@/lib/mail/sink-store";

const compose = (options: ConstructorParameters<typeof MailComposer>[0]) =>
  new Promise<Buffer>((resolve, reject) => new MailComposer(options).compile().build((err, msg) => (err ? reject(err) : resolve(msg))));

describe("parseMessage", () => {
  it("reads headers, text and HTML of a multipart/alternative message", async () => {
    const raw = await compose({
      from: "Pinchpoint <pinchpoint@harbor-pantry.example>",
      to: ["checkout@harbor-pantry.example", "arch@harbor-pantry.example"],
      subject: "Größe → top ten: ümlauts and a long subject line that nodemailer will fold across several header lines for sure",
      text: `Plain body with ünïcode and a very long line ${"x".repeat(200)} end`,
      html: `<p style="color:#d9a441">HTML body — “quotes” ${"y".repeat(120)}</p>`,
      date: new Date("2030-05-06T07:08:09Z"),
      headers: { "X-Pinchpoint-Template": "invite" },
    });
    const mail = await parseMessage(raw);
    expect(mail.from).toBe("Pinchpoint <pinchpoint@harbor-pantry.example>");
    expect(mail.to).toBe("checkout@harbor-pantry.example, arch@harbor-pantry.example");
    expect(mail.subject).toBe("Größe → top ten: ümlauts and a long subject line that nodemailer will fold across several header lines for sure");
    expect(mail.date?.toISOString()).toBe("2030-05-06T07:08:09.000Z");
    expect(mail.text?.trimEnd()).toBe(`Plain body with ünïcode and a very long line ${"x".repeat(200)} end`);
    expect(mail.html).toBe(`<p style="color:#d9a441">HTML body — “quotes” ${"y".repeat(120)}</p>`);
    expect(mail.headers.get("x-pinchpoint-template")).toBe("invite");
  });

  it("reads base64 bodies", async () => {
    const raw = await compose({ from: "a@example.com", to: "b@example.com", subject: "b64", text: "日本語のテキスト", textEncoding: "base64" });
    const mail = await parseMessage(raw);
    expect(mail.text?.trimEnd()).toBe("日本語のテキスト");
    expect(mail.html).toBeNull();
  });

  it("decodes RFC 2047 encoded words (the examples of RFC 2047 §8) and quoted-printable bodies (RFC 2045 §6.7)", async () => {
    const raw = [
      "From: =?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?= <keld@dkuug.dk>",
      "To: =?US-ASCII?Q?Keith_Moore?= <moore@cs.utk.edu>",
      "Subject: (=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)",
      "Content-Type: text/plain; charset=utf-8",
      "Content-Transfer-Encoding: quoted-printable",
      "",
      "a=3Db=",
      "c",
      "",
    ].join("\r\n");
    const mail = await parseMessage(raw);
    expect(mail.from).toBe("Keld Jørn Simonsen <keld@dkuug.dk>");
    expect(mail.to).toBe("Keith Moore <moore@cs.utk.edu>");
    expect(mail.subject).toBe("(ab)");
    expect(mail.text?.trimEnd()).toBe("a=bc");
  });
});
