/**
 * The Overview of an empty organisation says so and offers the first steps:
 * a site, a meter on it, a gateway; each links to where it is done, for the
 * roles that may do it.
 */
import { randomUUID } from "node:crypto";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client, locationOf } from "../support/http";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

/** The anchors of a page: href and text, tags inside the text dropped. */
function links(html: string): { href: string; text: string }[] {
  return [
    ...html.matchAll(/<a\b[^>]*href="([^"]*)"[^>]*>([\s\S]*?)<\/a>/g),
  ].map(([, href, text]) => ({
    href: href.replaceAll("&amp;", "&"),
    text: text.replace(/<[^>]+>/g, "").trim(),
  }));
}

async function signUp(): Promise<{ client: Client; orgId: string }> {
  const tag = randomUUID().slice(0, 8);
  const client = new Client();
  const response = await client.post("/sign-up", {
    organization: `Thornbury Works ${tag}`,
    name: "Ada Lindqvist",
    email: `ada-${tag}@thornbury.example`,
    password: "thornbury-pass-1",
    confirm: "thornbury-pass-1",
  });
  expect(response.status).toBe(302);
  const orgId = /^\/o\/([0-9a-f-]{36})$/.exec(locationOf(response))![1];
  return { client, orgId };
}

describe("the Overview of an empty organisation", () => {
  it('a freshly signed-up organisation sees "No sites yet" and links to add a site, a meter and a gateway', async () => {
    const { client, orgId } = await signUp();
    const response = await client.get(`/o/${orgId}/overview`);
    expect(response.status).toBe(200);
    const html = await response.text();
    expect(html).toContain("No sites yet");
    const base = `/o/${orgId}`;
    const steps = links(html).filter((l) => l.text.startsWith("Add a"));
    expect(steps).toEqual([
      { href: `${base}/sites#new-site-heading`, text: "Add a site" },
      { href: `${base}/sites`, text: "Add a meter" },
      { href: `${base}/gateways`, text: "Add a gateway" },
    ]);
    // No figures to show yet, so no empty charts and tables either.
    expect(html).not.toContain("Energy delivered and exported per month");

    // Each link leads to its form.
    expect(await (await client.get(`${base}/sites`)).text()).toContain(
      'id="new-site-heading"',
    );
    expect(await (await client.get(`${base}/gateways`)).text()).toContain(
      "Add a gateway",
    );

    // With a site, the meter step leads to that site's new-meter form.
    const site = await client.post(`${base}/sites`, {
      intent: "save-site",
      name: "Pump house",
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(site.status).toBe(302);
    const siteId = locationOf(site).split("/").pop()!;
    const after = await (await client.get(`${base}/overview`)).text();
    expect(after).toContain("No meters yet");
    expect(after).toContain("Step 1 · done");
    const next = links(after).filter((l) => l.text.startsWith("Add a"));
    expect(next).toEqual([
      { href: `${base}/sites/${siteId}/meters/new`, text: "Add a meter" },
      { href: `${base}/gateways`, text: "Add a gateway" },
    ]);
    expect(
      (await client.get(`${base}/sites/${siteId}/meters/new`)).status,
    ).toBe(200);
  });

  it("members who cannot add sites or gateways read the steps without links", async () => {
    const org = await createOrganization(["auditor"]);
    const auditor = new Client();
    await auditor.signIn(org.members[0].email, org.members[0].password);
    const html = await (await auditor.get(`/o/${org.id}/overview`)).text();
    expect(html).toContain("No sites yet");
    expect(links(html).filter((l) => l.text.startsWith("Add a"))).toEqual([]);
    expect(html).toContain("An owner or energy manager does this.");
  });
});
