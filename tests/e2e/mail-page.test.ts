// E-mail end to end: an owner assignment in the browser queues a notice, the worker delivers it to
// the SMTP sink, and the admin's mail page shows it with the team's address as recipient.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile, ownOrigin, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "admin", { width: 1366, height: 900 });
});

describe("mail", () => {
  it("delivers an owner-assigned notice to the team address and shows it to the admin", async () => {
    // nightly-batch-box is one of the demo's unowned components; no other test touches it.
    const res = await page.request.patch(`${baseUrl()}/api/v1/environments/production/components/nightly-batch-box`, { data: { team: "data-platform" }, headers: ownOrigin() });
    expect(res.status()).toBe(200);
    const deadline = Date.now() + 30_000;
    for (;;) {
      await page.goto(`${baseUrl()}/admin/mail`);
      const text = (await page.getByTestId("mail-list").textContent().catch(() => "")) ?? "";
      if (text.includes("nightly-batch-box") && text.includes("data-platform@harbor-pantry.example")) break;
      if (Date.now() > deadline) throw new Error(`no owner-assigned message in the sink after 30 s; the list shows: ${text.slice(0, 300)}`);
      await page.waitForTimeout(1_000);
    }
    await page.getByTestId("mail-list").getByText(/nightly-batch-box/).first().click();
    await page.waitForURL(/m=/);
    await screenshot(page, "admin-mail");
  });
});
