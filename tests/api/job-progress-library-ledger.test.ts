import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, testDb } from "../support/db";
import { makeApprovedRun } from "../support/planning-fixtures";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});

/** HTML text without tags, spaces squeezed: what a reader sees. */
const words = (html: string) =>
  html
    .replace(/<!--.*?-->/g, "")
    .replace(/<[^>]+>/g, " ")
    .replace(/\s+/g, " ");

let cutRun: Awaited<ReturnType<typeof makeApprovedRun>>;

describe("a job's cutting progress per part", () => {
  it("gives ordered, cut, rejected and owed per part line, in the API and on the job page", async () => {
    cutRun = await makeApprovedRun(); // one part line of 2 pieces, planned into one block
    const { runId, block, partIds, jobId } = cutRun;
    const before = await planner.get(`/api/jobs/${jobId}`);
    expect(before.status).toBe(200);
    expect(before.body.progress).toEqual([
      expect.objectContaining({ partId: partIds[0], ordered: 2, cut: 0, rejected: 0, owed: 2 }),
    ]);

    const res = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, {
      rejects: [{ jobPartId: partIds[0], count: 1, reason: "void in the cut face" }],
      confirm: true,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);

    const after = await planner.get(`/api/jobs/${jobId}`);
    expect(after.body.progress).toEqual([
      expect.objectContaining({ partId: partIds[0], ordered: 2, cut: 1, rejected: 1, owed: 1 }),
    ]);

    const page = await planner.get(`/jobs/${jobId}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain('data-testid="job-part-progress"');
    const table = words(page.text.slice(page.text.indexOf('data-testid="job-part-progress"')));
    for (const h of ["Ordered", "Cut", "Rejected", "Owed"]) expect(table).toContain(h);
    // The row: name, grade, ordered 2, cut 1, rejected 1, owed 1.
    expect(table).toMatch(/Test panel EPS-II 2 1 1 1 /);
  });
});

describe("the part library's search", () => {
  const tag = `Zq${Date.now().toString(36)}`;

  it("finds parts by words of the name, the kit or the grade code (?q=), in the API and on the page", async () => {
    const eps9 = (await testDb()("grades").where({ code: "EPS-IX" }).first("id"))!.id as number;
    const make = (name: string, kit: string, gradeId: number | null = null) =>
      planner.post("/api/library", { name, kit, size: [400, 200, 30], gradeId, defaultQuantity: 1 });
    expect((await make(`${tag} wing rib`, `${tag} glider`)).status).toBe(201);
    expect((await make(`${tag} tail fin`, `${tag} glider`, eps9)).status).toBe(201);
    expect((await make(`${tag} stage step`, `${tag} panto`)).status).toBe(201);

    const names = async (q: string) =>
      ((await planner.get(`/api/library?q=${encodeURIComponent(q)}`)).body.items as { name: string }[])
        .map((p) => p.name)
        .sort();
    expect(await names(`${tag} rib`)).toEqual([`${tag} wing rib`]);
    expect(await names(`${tag.toLowerCase()} GLIDER`)).toEqual([`${tag} tail fin`, `${tag} wing rib`]);
    expect(await names(`${tag} EPS-IX`)).toEqual([`${tag} tail fin`]);
    expect(await names(`${tag} nothing-like-this`)).toEqual([]);
    // Wildcards are taken as text.
    expect(await names(`${tag}%`)).toEqual([]);

    const page = await planner.get(`/library?q=${encodeURIComponent(`${tag} panto`)}`);
    expect(page.status).toBe(200);
    const text = words(page.text);
    expect(text).toContain(`${tag} stage step`);
    expect(text).not.toContain(`${tag} wing rib`);
    expect(text).toContain(`1 part matches “${tag} panto”`);
    // A real form: GET to /library with a q box and a submit button, so Enter and the button both search.
    expect(page.text).toMatch(/<form[^>]*action="\/library"[^>]*>|<form[^>]*method="get"[^>]*action="\/library"/);
    const box = /<input id="library-q"[^>]*>/.exec(page.text)?.[0] ?? "";
    expect(box).toContain('name="q"');
    expect(box).toContain('type="search"');
    expect(page.text).toMatch(/<button[^>]*type="submit"[^>]*>Search<\/button>/);

    const none = words((await planner.get(`/library?q=${tag}-absent`)).text);
    expect(none).toContain(`No library part matches “${tag}-absent”`);
  });
});

describe("the stock ledger", () => {
  it("pages by keyset: `older` leads on exactly where the page ended, and the last page says there is no more", async () => {
    const ten = await planner.get("/api/ledger?pageSize=10");
    expect(ten.status).toBe(200);
    const first = await planner.get("/api/ledger?pageSize=5");
    expect(first.body.items.map((e: { id: number }) => e.id)).toEqual(
      ten.body.items.slice(0, 5).map((e: { id: number }) => e.id),
    );
    expect(first.body.older).toBe(first.body.items[4].id);
    const second = await planner.get(`/api/ledger?pageSize=5&before=${first.body.older}`);
    expect(second.body.items.map((e: { id: number }) => e.id)).toEqual(
      ten.body.items.slice(5, 10).map((e: { id: number }) => e.id),
    );
    expect(second.body.total).toBe(first.body.total);

    // One block's history: received, reserved, consumed.
    const { block } = cutRun;
    const p1 = await planner.get(`/api/ledger?block=${block.id}&pageSize=2`);
    expect(p1.body.items.map((e: { kind: string }) => e.kind)).toEqual(["consumed", "reserved"]);
    const p2 = await planner.get(`/api/ledger?block=${block.id}&pageSize=2&before=${p1.body.older}`);
    expect(p2.body.items.map((e: { kind: string }) => e.kind)).toEqual(["received"]);
    expect(p2.body.older).toBeNull();
    expect((await planner.get("/api/ledger?before=0")).status).toBe(400);
  });

  it("shows an Older link past the newest 100 rows, and the older page goes on from there", async () => {
    const total = (await planner.get("/api/ledger?pageSize=1")).body.total as number;
    expect(total).toBeGreaterThan(100);
    const page = await planner.get("/ledger");
    const older = /href="(\/ledger\?before=(\d+))"[^>]*>Older</.exec(page.text);
    expect(older, "an Older link").toBeTruthy();
    const api = await planner.get("/api/ledger?pageSize=100");
    expect(Number(older![2])).toBe(api.body.items[99].id);
    const next = await planner.get(older![1]!.replace(/&amp;/g, "&"));
    expect(next.status).toBe(200);
    expect(next.text).toMatch(/href="\/ledger"[^>]*>Newest</);
  });

  it("links a movement made by a plan to that plan's page", async () => {
    const { runId } = cutRun;
    const page = await planner.get("/ledger?kind=consumed");
    expect(page.status).toBe(200);
    expect(page.text).toMatch(new RegExp(`href="/plans/${runId}"[^>]*>Cut to plan #${runId}`));
    // The plan page is there to land on.
    expect((await planner.get(`/plans/${runId}`)).status).toBe(200);
  });
});
