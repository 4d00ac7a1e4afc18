// Templates: data is escaped in HTML, kept verbatim in text, subjects stay one header line, and
// links point into the app at the URLs of DESIGN §6.
import { describe, expect, it } from "vitest";
import { renderMail } from "@/lib/mail/templates";
import { html, lines } from "@/lib/mail/templates/html";

const ctx = { appUrl: "https://pinchpoint.harbor-pantry.example/" };
const HOSTILE = `<script>alert("x")</script> & 'quotes'`;
const env = { slug: "production", name: `Prod ${HOSTILE}` };

/** Every text node and attribute of the HTML, without tags: hostile markup must survive only as escaped text. */
function assertNoRawMarkup(html: string) {
  expect(html).not.toContain("<script");
  expect(html).not.toContain(`"x")`);
  expect(html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;quotes&#39;");
}

describe("html`…`", () => {
  it("escapes the five characters of HTML text and attributes in every value (OWASP XSS prevention cheat sheet, rules 1–2)", () => {
    const value = `<a href="x" title='y'>&</a>`;
    expect(html`<p title="${value}">${value}</p>`.toString()).toBe(
      '<p title="&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;">&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;</p>',
    );
    expect(html`${42}`.toString()).toBe("42");
  });
  it("keeps markup made by html`…` as it is (no double escaping), joins arrays and drops null, undefined and false", () => {
    const cell = html`<td>${"a & b"}</td>`;
    const shown = (show: boolean) => show && cell;
    expect(html`<tr>${[cell, shown(true)]}</tr>${null}${undefined}${shown(false)}`.toString()).toBe("<tr><td>a &amp; b</td><td>a &amp; b</td></tr>");
  });
  it("gives no way to pass a string that claims to be escaped: it is escaped again", () => {
    const alreadyEscaped = "&lt;b&gt;";
    expect(html`${alreadyEscaped}`.toString()).toBe("&amp;lt;b&amp;gt;");
  });
  it("turns line breaks of text into <br> after escaping", () => {
    expect(lines("one <i>\ntwo").toString()).toBe("one &lt;i&gt;<br>two");
  });
});

describe("ownerAssigned", () => {
  const mail = renderMail(
    "ownerAssigned",
    { environment: env, component: { key: "session-store", name: `Session ${HOSTILE}` }, team: { slug: "checkout", name: `Checkout ${HOSTILE}` }, actorLabel: `lead ${HOSTILE}` },
    ctx,
  );
  it("escapes every piece of data in HTML", () => assertNoRawMarkup(mail.html));
  it("keeps data verbatim in the text part and links to the component page", () => {
    expect(mail.text).toContain(`lead ${HOSTILE} assigned Session ${HOSTILE} (session-store)`);
    expect(mail.text).toContain("https://pinchpoint.harbor-pantry.example/environments/production/components/session-store");
    expect(mail.html).toContain('href="https://pinchpoint.harbor-pantry.example/environments/production/components/session-store"');
  });
  it("names the team and component in a one-line subject", () => {
    expect(mail.subject).toBe(`[Pinchpoint] Checkout ${HOSTILE} now owns session-store in production`);
    expect(mail.subject).not.toMatch(/[\r\n]/);
  });
});

describe("newTopTen", () => {
  const entries = [
    { key: "dns-resolver", name: `DNS ${HOSTILE}`, position: 1, pinchScore: 71.234, blastDown: 120, blastDegraded: 9, team: "platform" },
    { key: "bus", name: "bus", position: 7, pinchScore: 40, blastDown: 12, blastDegraded: 0, team: null },
  ];
  const team = renderMail("newTopTen", { environment: env, snapshotNumber: 14, audience: { kind: "team", teamName: `Platform ${HOSTILE}` }, entries }, ctx);
  const arch = renderMail("newTopTen", { environment: env, snapshotNumber: 14, audience: { kind: "architects" }, entries }, ctx);
  it("escapes data in HTML for both audiences", () => {
    assertNoRawMarkup(team.html);
    assertNoRawMarkup(arch.html);
  });
  it("lists snapshot number, place, score to one decimal, blast radius and owner", () => {
    expect(team.text).toContain("Snapshot 14 of");
    expect(team.text).toContain("#1  dns-resolver (DNS");
    expect(team.text).toContain("pinch score 71.2, blast radius 120 down / 9 degraded, team platform");
    expect(team.text).toContain("#7  bus: pinch score 40.0, blast radius 12 down / 0 degraded, unowned");
    expect(team.text).toContain("https://pinchpoint.harbor-pantry.example/environments/production/pinch-points");
    expect(team.subject).toBe("[Pinchpoint] 2 components entered the top ten pinch points in production");
  });
  it("carries the caution that rankings are only as good as the inventory (DESIGN §9)", () => {
    expect(arch.text).toContain("only as good as the inventory");
    expect(arch.html).toContain("only as good as the inventory");
  });
  it("uses a singular subject for one newcomer", () => {
    const one = renderMail("newTopTen", { environment: env, snapshotNumber: 2, audience: { kind: "architects" }, entries: entries.slice(0, 1) }, ctx);
    expect(one.subject).toBe("[Pinchpoint] dns-resolver entered the top ten pinch points in production");
  });
});

describe("reviewDue", () => {
  const base = { environment: env, component: { key: "orders-db", name: "Orders DB" }, status: "accepted", reviewBy: "2030-03-01", rationale: `line one ${HOSTILE}\nline two` };
  it("says due today or overdue, escapes the rationale and keeps its line breaks", () => {
    const due = renderMail("reviewDue", { ...base, overdue: false }, ctx);
    const late = renderMail("reviewDue", { ...base, overdue: true }, ctx);
    expect(due.subject).toBe("[Pinchpoint] Risk review of orders-db in production due 2030-03-01");
    expect(late.subject).toBe("[Pinchpoint] Risk review of orders-db in production overdue since 2030-03-01");
    expect(due.text).toContain("is due today, 2030-03-01");
    expect(late.text).toContain("was due on 2030-03-01");
    assertNoRawMarkup(due.html);
    expect(due.html).toContain("<br>line two");
  });
});

describe("invite", () => {
  it("puts the one-time link in both parts, escaped in the attribute", () => {
    const link = "https://pinchpoint.example/invite/abc?x=1&y=2";
    const mail = renderMail("invite", { link, invitedBy: `Admin ${HOSTILE}`, expiresAt: new Date("2030-01-02T03:04:00Z") }, ctx);
    expect(mail.text).toContain(link);
    expect(mail.text).toContain("expires on 2030-01-02 03:04 UTC");
    expect(mail.html).toContain('href="https://pinchpoint.example/invite/abc?x=1&amp;y=2"');
    assertNoRawMarkup(mail.html);
  });
  it("refuses a link that is not http(s), so a javascript: URL never reaches an href", () => {
    expect(() => renderMail("invite", { link: "javascript:alert(1)" }, ctx)).toThrow(/absolute http/);
  });
});

describe("riskDigest", () => {
  const data = {
    week: "2030-W24",
    environments: [
      {
        environment: env,
        snapshotNumber: 12,
        baselineNumber: 9,
        movers: [{ key: "session-store", name: `Sessions ${HOSTILE}`, before: 30, after: 45.26, rankBefore: 3, rankAfter: 1 }],
        overdueReviews: [{ key: "orders-db", name: "orders-db", status: "accepted", reviewBy: "2030-06-01", reviewer: null }],
        newSinglePoints: [{ key: "bus", name: "Bus", blastDown: 7, team: null }],
      },
    ],
  };
  const mail = renderMail("riskDigest", data, ctx);
  it("escapes every piece of data in HTML", () => assertNoRawMarkup(mail.html));
  it("counts what it lists in a one-line subject", () => {
    expect(mail.subject).toBe("[Pinchpoint] Weekly risk digest, 2030-W24: 1 mover, 1 overdue review, 1 new single point of failure");
  });
  it("lists movers with the change and ranks, reviews with their date, single points with what they take down, and links each component", () => {
    expect(mail.text).toContain(`session-store (Sessions ${HOSTILE}): 30.0 → 45.3 (+15.3), rank #3 → #1`);
    expect(mail.text).toContain("orders-db: accepted, review by 2030-06-01, no reviewer");
    expect(mail.text).toContain("bus (Bus): takes 7 down, unowned");
    expect(mail.text).toContain(`Prod ${HOSTILE} (production): snapshot 12 against snapshot 9`);
    expect(mail.html).toContain('href="https://pinchpoint.harbor-pantry.example/environments/production/components/orders-db"');
    expect(mail.html).toContain('href="https://pinchpoint.harbor-pantry.example/environments/production/pinch-points"');
  });
  it("carries the caution that rankings are only as good as the inventory (DESIGN §9)", () => {
    expect(mail.text).toContain("only as good as the inventory");
    expect(mail.html).toContain("only as good as the inventory");
  });
});

describe("links", () => {
  it("percent-encodes path segments from data", () => {
    const mail = renderMail("ownerAssigned", { environment: { slug: "production", name: "p" }, component: { key: "a/../b c", name: "x" }, team: { slug: "t", name: "T" }, actorLabel: "me" }, ctx);
    expect(mail.text).toContain("/environments/production/components/a%2F..%2Fb%20c");
  });
});
