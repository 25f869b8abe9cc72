import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { client, demoEmail } from "../support/http";
import { closeTestDb, makeBlock, testDb } from "../support/db";
import { makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

interface StepsBody {
  procedure: { ok: true; cutCount: number; steps: { n: number; next: { what: { kind: string } }[] }[] };
  done: { step: number }[];
}

describe("at the machine, on a tablet", () => {
  it("a cutter follows a plan of 30+ cuts step by step, stops, goes on in a new session, records a reject on its step, records the block part-cut, and undoes it", async () => {
    // A block of 24 small blanks: well over 30 cuts. Approved through the API, as a planner does.
    const block = await makeBlock({ size: [1220, 800, 420] });
    const { jobId } = await makeJobWithParts([
      { name: "Cornice blank", quantity: 24, size: [290, 190, 95], gradeCode: "EPS-II" },
    ]);
    const { runId } = await makeDoneRun(jobId, [block]);
    const planner = client();
    await planner.signIn(demoEmail("planner"));
    expect((await planner.post(`/api/runs/${runId}/approve`)).status).toBe(200);
    const api = client();
    await api.signIn(demoEmail("cutter"));
    const steps = (await api.get(`/api/runs/${runId}/blocks/${block.id}/steps`)).body as StepsBody;
    expect(steps.procedure.ok).toBe(true);
    expect(steps.procedure.cutCount).toBeGreaterThanOrEqual(30);
    // The first step where a part comes off: the reject is recorded there.
    const partStep = steps.procedure.steps.find((s) => s.next.some((n) => n.what.kind === "part"))!.n;
    expect(partStep).toBeLessThan(steps.procedure.steps.length); // something is left for "part-cut"

    // First tablet: steps 1 … partStep, a reject on the last of them.
    const first = await signedInPage(browser, "cutter", VIEWPORTS.tablet);
    await first.goto(`${BASE_URL}/plans/${runId}/cut`);
    await first.getByRole("heading", { name: /^Step 1 of \d+/ }).waitFor();
    await screenshot(first, "machine-step-1-tablet");
    for (let n = 1; n <= partStep; n++) {
      await first.getByRole("heading", { name: new RegExp(`^Step ${n} of`) }).waitFor();
      if (n === partStep) {
        await first.getByText("A part from this step is bad…").click();
        await first.getByRole("combobox", { name: "Part" }).selectOption({ index: 1 });
        await first.getByLabel("How many", { exact: true }).fill("1");
        await first.getByLabel("Why", { exact: true }).fill("void in the cut face");
        await first.getByRole("button", { name: "Add reject" }).click();
        await first.getByText(/To record with this step: 1 × Cornice blank/).waitFor();
        await screenshot(first, "machine-reject-on-step-tablet");
      }
      await first.getByRole("button", { name: `Step ${n} done` }).click();
      await expect.poll(async () => (await testDb()("plan_block_steps").where({ run_id: runId })).length).toBe(n);
    }
    await first.context().close();

    // A new session on another tablet goes on where the first stopped.
    const second = await signedInPage(browser, "cutter", VIEWPORTS.tablet);
    await second.goto(`${BASE_URL}/plans/${runId}/cut`);
    await second.getByText(`${partStep} of ${steps.procedure.steps.length} steps done`).waitFor();
    await second.getByRole("heading", { name: new RegExp(`^Step ${partStep + 1} of`) }).waitFor();
    expect(await second.getByText(/Rejected in this step/).count()).toBe(0); // on its own step, not this one
    await screenshot(second, "machine-resumed-tablet");

    // Part-cut: asks first, then says what went back to stock.
    await second.getByRole("button", { name: "Record part-cut…" }).click();
    await second.getByRole("button", { name: /^Yes, record .+ part-cut$/ }).click();
    // The answer names the uncut pieces; the page then refreshes and lists them with the offcuts
    // (either way the codes are on the page): read the codes once the block shows as part-cut.
    await second
      .getByText(/is recorded part-cut/)
      .first()
      .waitFor();
    const text = (await second.locator("main").textContent()) ?? "";
    // Only the codes the notice lists as in stock ("… in stock: HF-1.4, HF-1.5."), not the step list's.
    const codes = [...text.matchAll(/in stock: ((?:[A-Za-z0-9-]+\.\d+(?:, )?)+)/g)]
      .flatMap((m) => m[1]!.split(", "))
      .filter((c) => c.startsWith(`${block.code}.`));
    expect(codes.length).toBeGreaterThan(0);
    await screenshot(second, "machine-part-cut-tablet");
    const rejected = await testDb()("cut_parts").where({ run_id: runId }).sum({ n: "rejected_count" }).first();
    expect(Number(rejected?.n)).toBe(1);

    // Stock and the job changed.
    await second.goto(`${BASE_URL}/stock/${encodeURIComponent(codes[0]!)}`);
    await second.getByRole("heading", { name: codes[0]! }).waitFor();
    expect(await second.getByText("Ready to cut", { exact: true }).count()).toBeGreaterThan(0);
    await second.goto(`${BASE_URL}/jobs/${jobId}`);
    await second.getByText("On the machine").first().waitFor();

    // Undo within the window: both come back.
    await second.goto(`${BASE_URL}/plans/${runId}/cut`);
    await second.getByRole("button", { name: /^Undo the recording of / }).click();
    await second.getByRole("button", { name: /^Yes, undo / }).click();
    await second.getByText(/is back in the plan, to be cut/).waitFor();
    await screenshot(second, "machine-undone-tablet");
    expect((await testDb()("blocks").where({ id: block.id }).first("status"))!.status).toBe("earmarked");
    expect((await testDb()("blocks").where({ code: codes[0] }).first("status"))!.status).toBe("written_off");
    await second.goto(`${BASE_URL}/jobs/${jobId}`);
    await second.getByText("Planned").first().waitFor();
    await second.context().close();
  });
});
