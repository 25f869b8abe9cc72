/**
 * The shop floor at 820 px with names nobody tuned on: a job and a part named with one long word
 * (a drawing's file name, a customer's reference) and letters from another script. The page body once
 * scrolled sideways at 820 px on the home page, the jobs list, the job, the plans list and at the
 * machine (where the reject field was squeezed to 32 px).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { client, demoEmail } from "../support/http";
import { closeTestDb, makeBlock, testDb } from "../support/db";
import { makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

/** The tablet at the machine, and a wide desk screen. */
const VIEWS = { tablet: VIEWPORTS.tablet, desk: { width: 1440, height: 900 } } as const;

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

/** What a person would see as wrong on the page: sideways scroll, small targets, leaked values. */
async function look(page: Page, targets: boolean) {
  return page.evaluate((targets) => {
    const de = document.documentElement;
    const small = targets
      ? [...document.querySelectorAll("main a, main button, main select, main summary, main input:not([type=hidden])")]
          .filter((el) => {
            if (el.tagName === "A" && getComputedStyle(el).display === "inline") {
              const around = (el.parentElement?.textContent ?? "").replace(el.textContent ?? "", "").trim();
              if (around.length) return false; // a link in running text
            }
            const input = el as HTMLInputElement;
            const t = input.type === "checkbox" || input.type === "radio" ? (el.closest("label") ?? el) : el;
            const r = t.getBoundingClientRect();
            return r.width > 0 && (r.width < 44 || r.height < 44);
          })
          .map((el) => {
            const r = el.getBoundingClientRect();
            return `${el.tagName.toLowerCase()} ${Math.round(r.width)}×${Math.round(r.height)}`;
          })
      : [];
    const text = document.querySelector("main")?.textContent ?? "";
    const leaks = text.match(/\bNaN\b|\bundefined\b|\bjp-\d+|\bslab-\d+/g) ?? [];
    return { overflow: de.scrollWidth - de.clientWidth, small, leaks };
  }, targets);
}

describe("long names at 820 px", () => {
  it("no page body scrolls sideways and at the machine every target stays at least 44 px", async () => {
    // Underscores and dots, as in a drawing's file name, give the browser no place to break a line.
    const longName = `Шаблон ${"KESTREL_WINGROOT_RIB_".repeat(5)}REV7`;
    const block = await makeBlock({ size: [1220, 800, 420] });
    const { jobId } = await makeJobWithParts([
      { name: `rib_${"naca2412_station".repeat(6)}.dxf`, quantity: 3, size: [300, 200, 100], gradeCode: "EPS-II" },
    ]);
    await testDb()("jobs").where({ id: jobId }).update({ name: longName });
    const { runId } = await makeDoneRun(jobId, [block]);
    const planner = client();
    await planner.signIn(demoEmail("planner"));
    expect((await planner.post(`/api/runs/${runId}/approve`)).status).toBe(200);

    const seen: Record<string, Awaited<ReturnType<typeof look>>> = {};
    for (const [role, paths] of [
      ["planner", ["/", "/jobs", `/jobs/${jobId}`, "/plans", `/plans/${runId}`]],
      ["cutter", [`/plans/${runId}/cut`]],
    ] as const) {
      for (const [view, size] of Object.entries(VIEWS)) {
        const page = await signedInPage(browser, role, size);
        for (const path of paths) {
          await page.goto(`${BASE_URL}${path}`);
          await page.waitForLoadState("networkidle");
          const cut = path.endsWith("/cut");
          if (cut) await page.getByRole("heading", { name: /^Step 1 of \d+/ }).waitFor();
          seen[`${role} ${view} ${path}`] = await look(page, cut && view === "tablet");
          if (view === "tablet" && (cut || path === "/jobs"))
            await screenshot(page, `fresh-eyes-long-name-${cut ? "cut" : "jobs"}-${role}-tablet`);
        }
        await page.context().close();
      }
    }
    const problems = Object.entries(seen).flatMap(([where, f]) => [
      ...(f.overflow > 0 ? [`${where}: the page is ${f.overflow} px wider than the screen`] : []),
      ...f.small.map((s) => `${where}: ${s} target`),
      ...f.leaks.map((l) => `${where}: "${l}" on the page`),
    ]);
    expect(problems).toEqual([]);
  });

  it("a table widened by large figures scrolls in a region the keyboard can reach, named", async () => {
    // A shop's biggest delivery: the largest block and cost the form takes widen the table at 820 px.
    const buyer = client();
    await buyer.signIn(demoEmail("buyer"));
    // Its own grade: 27,000 m³ of a demo grade would lift it over its reorder point for the tests after this one.
    const [grade] = await testDb()("grades")
      .insert({
        code: `WIDE-${Date.now().toString(36).toUpperCase()}`,
        material: "EPS",
        grade_system: "shop",
        grade: "test",
        cure_days: 1,
      })
      .returning("id");
    if (!grade) throw new Error("The test grade was not stored.");
    const supplier = (await testDb()("suppliers").orderBy("id").first("id"))!;
    const res = await buyer.post("/api/deliveries", {
      supplierId: supplier.id,
      receivedOn: "2026-12-05",
      lot: "LOT_2026_12_05_NIGHT_SHIFT_ROLL_7",
      blocks: [{ size: [30_000, 30_000, 30_000], gradeId: grade.id, cost: 9_999_999.99, location: "Yard_North" }],
    });
    expect(res.status).toBe(201);
    const stuck: string[] = [];
    for (const [role, path] of [
      ["buyer", "/deliveries"],
      ["buyer", "/ledger"],
      ["manager", "/reports"],
    ] as const) {
      const page = await signedInPage(browser, role, VIEWS.tablet);
      await page.goto(`${BASE_URL}${path}`);
      await page.waitForLoadState("networkidle");
      const regions = await page.evaluate(() =>
        [...document.querySelectorAll("main *")]
          .filter((el) => el.scrollWidth > el.clientWidth + 1 && /auto|scroll/.test(getComputedStyle(el).overflowX))
          .map((el) => ({ focusable: (el as HTMLElement).tabIndex >= 0, name: el.getAttribute("aria-label") ?? "" })),
      );
      if (path === "/deliveries") expect(regions.length, "the wide table scrolls in its own region").toBeGreaterThan(0);
      for (const r of regions) if (!r.focusable || !r.name) stuck.push(`${path}: ${JSON.stringify(r)}`);
      expect(await look(page, false)).toMatchObject({ overflow: 0, leaks: [] });
      if (path === "/deliveries") await screenshot(page, "fresh-eyes-wide-deliveries-buyer-tablet");
      await page.context().close();
    }
    expect(stuck).toEqual([]);
  });
});
