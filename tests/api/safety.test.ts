import { afterAll, describe, expect, it } from "vitest";
import { PAGE_POLICY, isPublicPage } from "@/lib/auth/policy";
import { SAFETY_SECTIONS } from "@/lib/safety/limits";
import { client, demoEmail } from "../support/http";
import { closeTestDb } from "../support/db";

afterAll(closeTestDb);

/** The page's text with tags dropped and entities of the page's own apostrophes and quotes undone. */
const text = (html: string) =>
  html
    .replace(/<style[\s\S]*?<\/style>/g, " ")
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;|&#39;|&apos;/g, "'")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ");

const headings = (html: string) => [...html.matchAll(/<h[12][^>]*>([^<]+)<\/h[12]>/g)].map((m) => m[1]!);

describe("the safety page opens without signing in", () => {
  it("is the one public page in the page policy", () => {
    expect(PAGE_POLICY["/safety"]).toBe("public");
    expect(isPublicPage("/safety")).toBe(true);
    expect(isPublicPage("/safety/")).toBe(true);
    expect(isPublicPage("/stock")).toBe(false);
    expect(isPublicPage("/safety-extra")).toBe(false);
    expect(isPublicPage(null)).toBe(false);
  });

  it("answers GET /safety without a cookie with 200 and the new sections, in a frame without the menu", async () => {
    const res = await client().get("/safety").redirects(0);
    expect(res.status, res.headers.location).toBe(200);
    const h = headings(res.text);
    expect(h).toContain("Safety cautions and their sources");
    // Pentane's exposure limits beside styrene's (NIOSH Pocket Guide; lib/safety/limits.ts PENTANE):
    // 1,000 ppm is 2,951 mg/m³ at 25 °C (1000 × 72.15 ÷ 24.45).
    expect(h).toContain("Pentane limits (United States)");
    expect(res.text).toMatch(/1,000<\/td><td[^>]*>2,951</);
    for (const s of SAFETY_SECTIONS) expect(h).toContain(s.title);
    expect(h).toEqual(
      expect.arrayContaining([
        "Dust from sanding, rasping and routing",
        "The wire and its power supply",
        "Fumes from the hot wire",
        "Fire at the cutter",
      ]),
    );
    expect(res.text).not.toContain('aria-label="Main"'); // no role menu for someone signed out
    expect(res.text).toMatch(/href="\/sign-in"/);
  });

  it("says what the issue asked for: dust standards, the wire's supply, other fumes, fire, jurisdiction", async () => {
    const t = text((await client().get("/safety")).text);
    for (const words of [
      "NFPA 652",
      "NFPA 654",
      "respirator",
      "isolating (safety) transformer",
      "never from an autotransformer",
      "Earth (ground)",
      "residual-current protection",
      "lock out",
      "eye protection",
      "carbon monoxide",
      "breakdown products",
      "Polyisocyanurate (PIR) and PVC foams are not hot-wired",
      "EPP",
      "fire extinguisher",
      "1.5 % by volume",
      "Exposure limits differ by jurisdiction",
      "where the fire code official requires it",
      "cartoned foam is Group A too",
      "licensed practice",
    ]) {
      expect(t, words).toContain(words);
    }
  });

  it("prints without the menu and bars", async () => {
    const html = (await client().get("/safety")).text;
    expect(html).toMatch(/@media print\s*\{[^}]*div:has\(> aside\.no-print\)/);
    const signedIn = client();
    await signedIn.signIn(demoEmail("cutter"));
    const inShell = await signedIn.get("/safety").redirects(0);
    expect(inShell.status).toBe(200);
    // Signed in: the usual shell, its menu marked not to print.
    expect(inShell.text).toMatch(/<aside class="no-print[^"]*"/);
    expect(inShell.text).toContain('aria-label="Main"');
  });

  it("still sends someone signed out from any other page to sign-in", async () => {
    for (const url of ["/", "/stock", "/plans/new", "/account"]) {
      const res = await client().get(url).redirects(0);
      expect([303, 307, 308], url).toContain(res.status);
      expect(res.headers.location, url).toMatch(/\/sign-in$/);
    }
  });
});
