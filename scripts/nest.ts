/**
 * Command line: `npm run --silent nest < problem.json > plan.json` (or `--in FILE`, `--out FILE`).
 * Invalid input: exit code 2, one line per problem on stderr naming its JSON path, nothing on stdout.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { nest, parseProblemText } from "@/lib/nesting";

function usage(msg: string): never {
  process.stderr.write(`${msg}\nusage: npm run --silent nest [-- --in problem.json] [--out plan.json] [--seed N]\n`);
  process.exit(2);
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  let inFile: string | undefined;
  let outFile: string | undefined;
  let seed = 1;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === "--in") inFile = args[++i] ?? usage("--in needs a file");
    else if (a === "--out") outFile = args[++i] ?? usage("--out needs a file");
    else if (a === "--seed") seed = Number(args[++i] ?? usage("--seed needs a number"));
    else usage(`unknown argument ${a}`);
  }
  let text: string;
  try {
    text = readFileSync(inFile ?? 0, "utf8");
  } catch {
    usage(`cannot read ${inFile ?? "standard input"}`);
  }
  const parsed = parseProblemText(text);
  if (!parsed.ok) {
    process.stderr.write(parsed.errors.map((e) => `${e}\n`).join(""));
    process.exit(2);
  }
  const controller = new AbortController();
  process.once("SIGINT", () => controller.abort());
  const plan = await nest(parsed.problem, { seed, now: () => performance.now(), signal: controller.signal });
  const out = `${JSON.stringify(plan, null, 2)}\n`;
  if (outFile) writeFileSync(outFile, out);
  else process.stdout.write(out);
}

main().catch((e: unknown) => {
  process.stderr.write(`nest: internal error: ${e instanceof Error ? e.message : String(e)}\n`);
  process.exit(1);
});
