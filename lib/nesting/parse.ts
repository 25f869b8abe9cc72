import { readOutline } from "./slab";
import type { Block, Defect, Layout, Part, Problem, Rotate, Settings, Vec3 } from "./types";

export type ParseResult = { ok: true; problem: Problem } | { ok: false; errors: string[] };

const LAYOUTS: readonly Layout[] = ["guillotine", "layers", "free"];
const ROTATES: readonly Rotate[] = ["any", "z", "none"];

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

/** Collects errors with their JSON path while reading a value. */
class Reader {
  errors: string[] = [];
  err(path: string, msg: string): void {
    this.errors.push(`${path}: ${msg}`);
  }
  num(o: Obj, key: string, path: string, rule: "pos" | "nonneg", dflt?: number): number {
    const v = o[key];
    const p = path ? `${path}.${key}` : key;
    if (v === undefined && dflt !== undefined) return dflt;
    if (v === undefined) return (this.err(p, "is required"), NaN);
    return this.checkNum(v, p, rule);
  }
  checkNum(v: unknown, p: string, rule: "pos" | "nonneg"): number {
    if (!isNum(v)) return (this.err(p, "must be a number"), NaN);
    if (rule === "pos" && !(v > 0)) return (this.err(p, "must be > 0"), NaN);
    if (rule === "nonneg" && v < 0) return (this.err(p, "must be >= 0"), NaN);
    return v;
  }
  vec3(o: Obj, key: string, path: string, rule: "pos" | "nonneg", dflt?: Vec3): Vec3 {
    const v = o[key];
    const p = `${path}.${key}`;
    if (v === undefined && dflt) return dflt;
    if (v === undefined) return (this.err(p, "is required"), [NaN, NaN, NaN]);
    if (!Array.isArray(v) || v.length !== 3) return (this.err(p, "must be an array of 3 numbers"), [NaN, NaN, NaN]);
    return [0, 1, 2].map((i) => this.checkNum(v[i], `${p}[${i}]`, rule)) as Vec3;
  }
  str(o: Obj, key: string, path: string, required: boolean): string | undefined {
    const v = o[key];
    const p = `${path}.${key}`;
    if (v === undefined || v === null) {
      if (required) this.err(p, "is required");
      return undefined;
    }
    if (typeof v !== "string") return (this.err(p, "must be a string"), undefined);
    if (required && v.trim() === "") return (this.err(p, "must not be empty"), undefined);
    return v;
  }
  oneOf<T extends string>(o: Obj, key: string, path: string, allowed: readonly T[], dflt: T): T {
    const v = o[key];
    if (v === undefined) return dflt;
    if (typeof v !== "string" || !(allowed as readonly string[]).includes(v)) {
      this.err(`${path}.${key}`, `must be one of ${allowed.map((a) => `"${a}"`).join(", ")}`);
      return dflt;
    }
    return v as T;
  }
}

function readSettings(r: Reader, raw: unknown): Settings {
  const s: Obj = raw === undefined ? {} : isObj(raw) ? raw : (r.err("settings", "must be an object"), {});
  const settings: Settings = {
    kerf: r.num(s, "kerf", "settings", "nonneg", 1.5),
    trim: r.num(s, "trim", "settings", "nonneg", 0),
    defectMargin: r.num(s, "defectMargin", "settings", "nonneg", 0),
    minOffcut: r.vec3(s, "minOffcut", "settings", "nonneg", [100, 100, 25]),
    layout: r.oneOf(s, "layout", "settings", LAYOUTS, "guillotine"),
    timeLimitMs: r.num(s, "timeLimitMs", "settings", "pos", 3000),
  };
  // Optional (README, "Slabs of true-shape nested profiles"): absent stays absent.
  if (s.trueShape !== undefined) {
    if (typeof s.trueShape !== "boolean") r.err("settings.trueShape", "must be true or false");
    else settings.trueShape = s.trueShape;
  }
  if (s.slabMax !== undefined) settings.slabMax = r.vec3(s, "slabMax", "settings", "pos");
  return settings;
}

function readDefect(r: Reader, raw: unknown, path: string, size: Vec3): Defect | undefined {
  if (!isObj(raw)) return (r.err(path, "must be an object"), undefined);
  const id = r.str(raw, "id", path, false);
  const min = r.vec3(raw, "min", path, "nonneg");
  const max = r.vec3(raw, "max", path, "nonneg");
  for (let i = 0; i < 3; i++) {
    const lo = min[i]!;
    const hi = max[i]!;
    const s = size[i]!;
    if (Number.isNaN(lo) || Number.isNaN(hi)) continue;
    if (hi < lo) r.err(`${path}.max[${i}]`, `must be >= min[${i}] (${lo})`);
    if (Number.isFinite(s) && hi > s) r.err(`${path}.max[${i}]`, `lies outside its block (size ${s})`);
    if (Number.isFinite(s) && lo > s) r.err(`${path}.min[${i}]`, `lies outside its block (size ${s})`);
  }
  return id === undefined ? { min, max } : { id, min, max };
}

/**
 * Reads one block; every error about it names the block by its id as well as its path (a person
 * looks for "HF-1003.4", not for the 70th entry of a list they never saw).
 */
function readBlock(r: Reader, raw: unknown, i: number, settings: Settings): Block | undefined {
  const path = `blocks[${i}]`;
  if (!isObj(raw)) return (r.err(path, "must be an object"), undefined);
  const first = r.errors.length;
  const block = readBlockFields(r, raw, path, settings);
  const id = typeof raw.id === "string" ? raw.id.trim() : "";
  if (id)
    for (let e = first; e < r.errors.length; e++)
      if (!r.errors[e]!.includes(`block ${id}`)) r.errors[e] = `${r.errors[e]} (block ${id})`;
  return block;
}

function readBlockFields(r: Reader, raw: Obj, path: string, settings: Settings): Block {
  const id = r.str(raw, "id", path, true) ?? "";
  const name = id.trim() ? `block ${id.trim()}` : path;
  const size = r.vec3(raw, "size", path, "pos");
  const grade = r.str(raw, "grade", path, false);
  let offcut = false;
  if (raw.offcut !== undefined) {
    if (typeof raw.offcut !== "boolean") r.err(`${path}.offcut`, "must be true or false");
    else offcut = raw.offcut;
  }
  const volumeM3 = (size[0] * size[1] * size[2]) / 1e9;
  const cost = r.num(raw, "cost", path, "nonneg", volumeM3);
  const trim = r.num(raw, "trim", path, "nonneg", offcut ? 0 : settings.trim);
  for (let a = 0; a < 3; a++) {
    if (Number.isFinite(size[a]!) && Number.isFinite(trim) && 2 * trim >= size[a]!) {
      r.err(
        raw.trim === undefined ? "settings.trim" : `${path}.trim`,
        `leaves no usable material in ${name} (size[${a}] = ${size[a]})`,
      );
      break;
    }
  }
  const defects: Defect[] = [];
  if (raw.defects !== undefined) {
    if (!Array.isArray(raw.defects)) r.err(`${path}.defects`, "must be an array");
    else
      raw.defects.forEach((d, j) => {
        const def = readDefect(r, d, `${path}.defects[${j}]`, size);
        if (def) defects.push(def);
      });
  }
  return { id, size, ...(grade !== undefined ? { grade } : {}), cost, offcut, trim, defects };
}

function readPart(r: Reader, raw: unknown, i: number): Part | undefined {
  const path = `parts[${i}]`;
  if (!isObj(raw)) return (r.err(path, "must be an object"), undefined);
  const id = r.str(raw, "id", path, true) ?? "";
  const size = r.vec3(raw, "size", path, "pos");
  let quantity = 1;
  if (raw.quantity !== undefined) {
    if (!isNum(raw.quantity)) r.err(`${path}.quantity`, "must be a number");
    else if (!Number.isInteger(raw.quantity) || raw.quantity < 1)
      r.err(`${path}.quantity`, "must be a whole number >= 1");
    else quantity = raw.quantity;
  }
  const grade = r.str(raw, "grade", path, false);
  const rotate = r.oneOf(raw, "rotate", path, ROTATES, "any");
  const part: Part = { id, size, quantity, ...(grade !== undefined ? { grade } : {}), rotate };
  if (raw.outline !== undefined) {
    const got = readOutline(raw.outline, `${path}.outline`, size);
    for (const e of got.errors) r.errors.push(e);
    if (got.outline) part.outline = got.outline;
  }
  return part;
}

function checkUnique(r: Reader, ids: (string | undefined)[], what: string): void {
  const first = new Map<string, number>();
  ids.forEach((id, i) => {
    if (!id) return;
    const j = first.get(id);
    if (j === undefined) first.set(id, i);
    else r.err(`${what}[${i}].id`, `duplicate id "${id}" (also ${what}[${j}])`);
  });
}

/**
 * Reads a problem (parsed JSON) into a typed `Problem` with defaults filled in, or lists every
 * error with its JSON path.
 * @example
 * parseProblem({ blocks: [{ id: "B", size: [100, 100, 100] }], parts: [{ id: "p", size: [10, 0, 10] }] })
 * // → { ok: false, errors: ["parts[0].size[1]: must be > 0"] }
 */
/**
 * Most pieces (the sum of the parts' quantities) in one problem. The search and its plan grow with
 * the pieces: 22,000 nest in well under a second, but a plan of 500,000 took a gigabyte and pages
 * that no one can read; an order that large is split into several runs.
 */
export const MAX_PIECES = 25_000;
/** Most blocks offered to one problem. */
export const MAX_BLOCKS = 2_000;

export function parseProblem(json: unknown): ParseResult {
  const r = new Reader();
  if (!isObj(json)) return { ok: false, errors: ["(root): must be a JSON object"] };
  if (json.version !== undefined && json.version !== 1) r.err("version", "must be 1");
  const settings = readSettings(r, json.settings);
  const blocks: Block[] = [];
  const parts: Part[] = [];
  if (json.blocks === undefined) r.err("blocks", "is required");
  else if (!Array.isArray(json.blocks)) r.err("blocks", "must be an array");
  else
    json.blocks.forEach((b, i) => {
      const blk = readBlock(r, b, i, settings);
      if (blk) blocks.push(blk);
    });
  if (json.parts === undefined) r.err("parts", "is required");
  else if (!Array.isArray(json.parts)) r.err("parts", "must be an array");
  else
    json.parts.forEach((p, i) => {
      const part = readPart(r, p, i);
      if (part) parts.push(part);
    });
  if (Array.isArray(json.blocks))
    checkUnique(
      r,
      json.blocks.map((b) => (isObj(b) && typeof b.id === "string" ? b.id : undefined)),
      "blocks",
    );
  if (Array.isArray(json.parts))
    checkUnique(
      r,
      json.parts.map((p) => (isObj(p) && typeof p.id === "string" ? p.id : undefined)),
      "parts",
    );
  const pieces = parts.reduce((n, p) => n + p.quantity, 0);
  if (pieces > MAX_PIECES)
    r.err(
      "parts",
      `${pieces} pieces in all (the sum of the quantities); at most ${MAX_PIECES} in one problem: split the order`,
    );
  if (blocks.length > MAX_BLOCKS) r.err("blocks", `${blocks.length} blocks; at most ${MAX_BLOCKS} in one problem`);
  if (r.errors.length > 0) return { ok: false, errors: r.errors };
  return { ok: true, problem: { version: 1, settings, blocks, parts } };
}

/**
 * Parses problem JSON text; malformed JSON is reported as an error at the root, never thrown.
 * @example parseProblemText('{"blocks": [') // → { ok: false, errors: ["(root): malformed JSON: ..."] }
 */
export function parseProblemText(text: string): ParseResult {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    // One line per problem: the engine's message may quote the input, newlines included.
    const msg = (e instanceof Error ? e.message : String(e)).replace(/\s+/g, " ");
    return { ok: false, errors: [`(root): malformed JSON: ${msg}`] };
  }
  return parseProblem(json);
}
