import "server-only";
import fs from "node:fs/promises";
import path from "node:path";
import { parseFont, type Font } from "@/lib/profiles/text";

/**
 * The letters Blockyard ships for text parts: Inter Bold (latin subset, WOFF) from the
 * @fontsource/inter package, under the SIL Open Font License 1.1 (its LICENSE file travels with
 * the package in node_modules). Read from disk once per server process.
 */
export const SHIPPED_FONT = {
  name: "Inter Bold",
  licence: "SIL Open Font License 1.1",
  file: "@fontsource/inter/files/inter-latin-700-normal.woff",
  fileName: "inter-latin-700-normal.woff",
} as const;

let loading: Promise<Font> | null = null;

/** The shipped font, parsed once. */
export function shippedFont(): Promise<Font> {
  loading ??= (async () => {
    // Read at run time (never bundled): the app runs from its own folder, node_modules beside it.
    const bytes = await fs.readFile(
      path.join(process.cwd(), "node_modules", "@fontsource", "inter", "files", SHIPPED_FONT.fileName),
    );
    const got = parseFont(bytes);
    if ("error" in got) throw new Error(`The shipped font cannot be read: ${got.error}`);
    return got.font;
  })().catch((e) => {
    loading = null;
    throw e;
  });
  return loading;
}
