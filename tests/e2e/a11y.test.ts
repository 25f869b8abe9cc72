/**
 * Readable and operable on a tablet at the machine.
 *
 * Source of the rules: WCAG 2.1 levels A and AA (https://www.w3.org/TR/WCAG21/) as axe-core 4.14
 * (https://github.com/dequelabs/axe-core) checks them in the browser, with its tags wcag2a,
 * wcag2aa, wcag21a and wcag21aa. A page passes when axe finds no violation of impact "serious" or
 * "critical" (contrast 1.4.3 and 1.4.11, names and labels 4.1.2, links told apart 1.4.1, …).
 * The 44 × 44 CSS px touch targets follow WCAG 2.1 success criterion 2.5.5 (Target Size), which
 * axe does not measure, so the second half of this file measures them itself at 820 px.
 */
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";

const require = createRequire(import.meta.url);
const AXE = require.resolve("axe-core/axe.min.js");
const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];

/** The smallest side of a touch target a finger hits reliably (WCAG 2.1, 2.5.5). */
const MIN_TARGET = 44;

interface AxeNode {
  target: string[];
  failureSummary?: string;
}
interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: AxeNode[];
}

/**
 * Each page with the role that opens it in daily work. A detail page is reached through the first
 * link matching `via` on its list page, so the test needs no seeded ids; `name` is how it is reported.
 */
const PAGES: { path: string; role: string; via?: string; name?: string }[] = [
  { path: "/sign-in", role: "" },
  { path: "/", role: "cutter" },
  { path: "/", role: "buyer" },
  { path: "/", role: "manager" },
  { path: "/", role: "planner" },
  { path: "/", role: "admin" },
  { path: "/stock", role: "buyer" },
  { path: "/stock", role: "cutter", via: "main tbody a[href^='/stock/']", name: "/stock/[code]" },
  { path: "/stock/import", role: "buyer" },
  { path: "/stock/count", role: "buyer" },
  { path: "/plans", role: "planner" },
  { path: "/plans", role: "planner", via: "main tbody a[href^='/plans/']", name: "/plans/[runId]" },
  { path: "/plans", role: "cutter", via: "main tbody a[href^='/plans/']", name: "/plans/[runId] (cutter)" },
  { path: "/plans/new", role: "planner" },
  { path: "/jobs", role: "planner" },
  { path: "/jobs", role: "planner", via: "main tbody a[href^='/jobs/']", name: "/jobs/[jobId]" },
  { path: "/library", role: "planner" },
  { path: "/deliveries", role: "buyer" },
  { path: "/deliveries/new", role: "buyer" },
  { path: "/ledger", role: "buyer" },
  { path: "/grades", role: "buyer" },
  { path: "/suppliers", role: "buyer" },
  { path: "/purchasing", role: "buyer" },
  { path: "/purchasing/orders", role: "buyer" },
  {
    path: "/purchasing/orders",
    role: "buyer",
    via: "main tbody a[href^='/purchasing/orders/']",
    name: "/purchasing/orders/[poId]",
  },
  { path: "/reports", role: "manager" },
  { path: "/claims", role: "buyer" },
  { path: "/machines", role: "planner" },
  { path: "/safety", role: "cutter" },
  { path: "/safety", role: "" }, // public: opens for someone signed out, without the menu
  { path: "/account", role: "cutter" },
  { path: "/defects/new", role: "cutter" },
  { path: "/labels", role: "cutter" },
  { path: "/admin/users", role: "admin" },
  { path: "/admin/settings", role: "admin" },
  { path: "/admin/outbox", role: "admin" },
];

/**
 * Violations not fixed yet, by page and rule id. Each entry is a TODO: the rest of the page is
 * enforced, and an entry that no longer fails should be removed.
 */
const KNOWN: Record<string, string[]> = {};

let browser: Browser;
const contexts: BrowserContext[] = [];
const signedIn = new Map<string, Page>();

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
});

/** One signed-in page per role and viewport, reused across the pages that role opens. */
async function pageFor(role: string, size: keyof typeof VIEWPORTS): Promise<Page> {
  const key = `${role}@${size}`;
  let page = signedIn.get(key);
  if (!page) {
    if (role) page = await signedInPage(browser, role, VIEWPORTS[size]);
    else {
      const context = await browser.newContext({ viewport: VIEWPORTS[size] });
      page = await context.newPage();
    }
    contexts.push(page.context());
    signedIn.set(key, page);
  }
  return page;
}

/** Opens `path`, or the first link matching `via` on it; returns the path opened. */
async function open(page: Page, path: string, via?: string): Promise<string> {
  await page.goto(`${BASE_URL}${path}`);
  if (!via) return path;
  const href = await page.locator(via).first().getAttribute("href");
  if (!href) throw new Error(`no link ${via} on ${path}`);
  await page.goto(`${BASE_URL}${href}`);
  return href;
}

async function axeViolations(page: Page): Promise<AxeViolation[]> {
  await page.addScriptTag({ path: AXE });
  const result = await page.evaluate(
    (values) =>
      // @ts-expect-error axe is the global the script tag above defines
      (window.axe as { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> }).run(document, {
        runOnly: { type: "tag", values },
        resultTypes: ["violations"],
      }),
    TAGS,
  );
  return result.violations;
}

/** The rule, and one node for each distinct failure (contrast: each pair of colours) so the fix is clear. */
function describeViolation(v: AxeViolation): string {
  const seen = new Map<string, string>();
  for (const n of v.nodes) {
    const why = (n.failureSummary ?? "").split("\n").slice(1, 2).join("").trim();
    const key = why.replace(/^Element has insufficient color contrast of [\d.]+ |\(?font size.*$/g, "");
    if (!seen.has(key)) seen.set(key, `    ${n.target.join(" ")}: ${why}`);
  }
  const nodes = [...seen.values()].slice(0, 12).join("\n");
  return `  ${v.id} (${v.impact}, ${v.nodes.length} nodes): ${v.help}\n${nodes}`;
}

describe("every main page meets WCAG 2.1 A and AA as axe-core checks it", () => {
  for (const size of ["tablet", "wide"] as const) {
    for (const { path, role, via, name = path } of PAGES) {
      it(`${size}: ${name} for the ${role || "stranger"} has no serious or critical violation`, async () => {
        const page = await pageFor(role, size);
        const opened = await open(page, path, via);
        await page.waitForLoadState("networkidle");
        const known = KNOWN[name] ?? [];
        const serious = (await axeViolations(page)).filter(
          (v) => (v.impact === "serious" || v.impact === "critical") && !known.includes(v.id),
        );
        if (serious.length) {
          await screenshot(page, `a11y${name.replace(/[^a-z0-9]+/gi, "-")}-${role || "stranger"}-${size}`);
        }
        expect(serious.map(describeViolation).join("\n"), `${opened} at ${VIEWPORTS[size].width} px`).toBe("");
        // One live region per page (WCAG 2.1 SC 4.1.3, status messages): results are said in the
        // page's announcer (its region sits in the closed shadow root of #page-announcer), never
        // by other regions in the page.
        const live = await page.evaluate(() =>
          [...document.querySelectorAll("[aria-live], [role=status], [role=alert], [role=log]")].map((el) =>
            el.outerHTML.slice(0, 80),
          ),
        );
        expect(live, `live regions on ${opened}`).toEqual([]);
        expect(await page.locator("#page-announcer").count()).toBe(1);
      });
    }
  }
});

interface Box {
  what: string;
  width: number;
  height: number;
}

/**
 * Width and height of each visible element matching `selector`. A checkbox or radio counts its
 * label; a link inside a sentence (inline, among other text) is exempt, as WCAG allows.
 */
async function boxes(page: Page, selector: string): Promise<Box[]> {
  return page.locator(selector).evaluateAll((els) =>
    els
      .filter((el) => {
        if (el.tagName !== "A" || getComputedStyle(el).display !== "inline") return true;
        const around = (el.parentElement?.textContent ?? "").replace(el.textContent ?? "", "").trim();
        return around.length === 0;
      })
      .map((el) => {
        const input = el as HTMLInputElement;
        const target = input.type === "checkbox" || input.type === "radio" ? (el.closest("label") ?? el) : el;
        const r = target.getBoundingClientRect();
        const name = (el.textContent || el.getAttribute("aria-label") || input.name || "").trim().slice(0, 40);
        return {
          what: `${el.tagName.toLowerCase()} "${name}"`,
          width: Math.round(r.width),
          height: Math.round(r.height),
        };
      })
      .filter((b) => b.width > 0 && b.height > 0),
  );
}

function tooSmall(found: Box[]): string[] {
  return found
    .filter((b) => b.width < MIN_TARGET || b.height < MIN_TARGET)
    .map((b) => `${b.what} ${b.width}×${b.height}`);
}

// Controls a finger needs: every link, button and form control in the page's main part except
// links inside running text (exempt above).
const CONTROLS = "main a, main button, main select, main summary, main input:not([type=hidden])";

describe("charts and drawings are named pictures with their facts in words", () => {
  it("the reports' charts are named and are not tab stops of their own", async () => {
    const page = await pageFor("manager", "tablet");
    await page.goto(`${BASE_URL}/reports`);
    await page.waitForLoadState("networkidle");
    const charts = await page.locator("main figure[role=img]").evaluateAll((els) =>
      els.map((el) => ({
        name: el.getAttribute("aria-label") ?? "",
        stops: el.querySelectorAll("[tabindex]:not([tabindex='-1']), a[href], button").length,
      })),
    );
    expect(charts.length).toBeGreaterThanOrEqual(3);
    for (const c of charts) {
      expect(c.name).toMatch(/\S/);
      expect(c.stops, c.name).toBe(0);
    }
  });

  it("a plan's drawings carry a title and the plan lists its cuts and parts in words", async () => {
    const page = await pageFor("planner", "tablet");
    await open(page, "/plans", "main tbody a[href^='/plans/']");
    const facts = page.locator("main details[data-testid^='plan-facts-']").first();
    await facts.locator("summary").click();
    await expect.poll(() => facts.locator("li").count()).toBeGreaterThan(0);
    const untitled = await page
      .locator("main svg[role=img]")
      .evaluateAll((els) => els.filter((el) => !el.querySelector("title")?.textContent).length);
    expect(untitled).toBe(0);
    await screenshot(page, "a11y-plan-facts-planner-tablet");
  });
});

describe("touch targets are at least 44 × 44 CSS px at 820 px", () => {
  it("the shell: Sign out, Account, Skip to content and the menu", async () => {
    const page = await pageFor("buyer", "tablet");
    await page.goto(`${BASE_URL}/`);
    const shell = await boxes(page, "nav[aria-label=Main] a, a[href='/account'], form button[type=submit]");
    expect(shell.map((b) => b.what).join(" ")).toMatch(/Sign out/);
    expect(shell.map((b) => b.what).join(" ")).toMatch(/Account/);
    expect(tooSmall(shell)).toEqual([]);
    // The skip link is the first tab stop and lands on the page's main content.
    await page.keyboard.press("Tab");
    const focused = await page.evaluate(() => {
      const a = document.activeElement as HTMLAnchorElement;
      const r = a.getBoundingClientRect();
      return { text: a.textContent, href: a.getAttribute("href"), height: r.height };
    });
    expect(focused.text).toBe("Skip to content");
    expect(focused.href).toBe("#main");
    expect(focused.height).toBeGreaterThanOrEqual(MIN_TARGET);
    await screenshot(page, "a11y-skip-link-tablet");
  });

  for (const [path, role] of [
    ["/", "cutter"],
    ["/", "planner"],
    ["/", "buyer"],
    ["/", "manager"],
    ["/", "admin"],
    ["/stock", "buyer"],
    ["/plans", "planner"],
    ["/jobs", "planner"],
    ["/library", "planner"],
    ["/deliveries", "buyer"],
    ["/deliveries/new", "buyer"],
    ["/ledger", "buyer"],
    ["/purchasing", "buyer"],
    ["/purchasing/orders", "buyer"],
    ["/reports", "manager"],
    ["/claims", "buyer"],
    ["/admin/outbox", "admin"],
  ] as const) {
    it(`${path} for the ${role}: row links, card links and main controls`, async () => {
      const page = await pageFor(role, "tablet");
      await page.goto(`${BASE_URL}${path}`);
      // The lists stream in: wait for the first row link where the demo data has rows.
      if (path === "/stock" || path === "/plans") await page.locator(`main a[href^='${path}/']`).first().waitFor();
      await page.waitForLoadState("networkidle");
      await screenshot(page, `a11y-targets${path.replace(/\//g, "-")}-${role}-tablet`);
      expect(tooSmall(await boxes(page, CONTROLS))).toEqual([]);
    });
  }

  it("a block's page for the cutter: Flag a defect and the page's controls", async () => {
    const page = await pageFor("cutter", "tablet");
    await open(page, "/stock", "main tbody a[href^='/stock/']");
    await page.getByRole("main").getByRole("link", { name: "Flag a defect" }).waitFor();
    await screenshot(page, "a11y-targets-block-cutter-tablet");
    expect(tooSmall(await boxes(page, CONTROLS))).toEqual([]);
  });

  it("a plan's page for the planner: the G-code links, the layers toggle and the page's controls", async () => {
    const page = await pageFor("planner", "tablet");
    await open(page, "/plans", "main tbody a[href^='/plans/']");
    await screenshot(page, "a11y-targets-plan-planner-tablet");
    expect(tooSmall(await boxes(page, CONTROLS))).toEqual([]);
  });
});
