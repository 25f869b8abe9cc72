/**
 * Just enough MIME reading for tests to check what a mail transport sent: headers, the parts of a
 * multipart message, and their decoded bodies (base64, quoted-printable, 7bit).
 */
export interface MimePart {
  headers: Record<string, string>;
  body: Buffer;
  parts: MimePart[];
}

function unfold(head: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of head.replace(/\r?\n[ \t]+/g, " ").split(/\r?\n/)) {
    const i = line.indexOf(":");
    if (i > 0) out[line.slice(0, i).trim().toLowerCase()] = line.slice(i + 1).trim();
  }
  return out;
}

function decodeQp(s: string): Buffer {
  const soft = s.replace(/=\r?\n/g, "");
  const bytes: number[] = [];
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === "=" && /^[0-9A-F]{2}$/i.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(soft.charCodeAt(i));
  }
  return Buffer.from(bytes);
}

export function parseMime(raw: string): MimePart {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split < 0 ? raw : raw.slice(0, split);
  const rest = split < 0 ? "" : raw.slice(split).replace(/^\r?\n\r?\n/, "");
  const headers = unfold(head);
  const type = headers["content-type"] ?? "text/plain";
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const chunks = rest.split(`--${boundary}`).slice(1);
    const parts = chunks.filter((c) => !c.startsWith("--")).map((c) => parseMime(c.replace(/^\r?\n/, "")));
    return { headers, body: Buffer.alloc(0), parts };
  }
  const enc = (headers["content-transfer-encoding"] ?? "7bit").toLowerCase();
  const body =
    enc === "base64"
      ? Buffer.from(rest.replace(/\s+/g, ""), "base64")
      : enc === "quoted-printable"
        ? decodeQp(rest)
        : Buffer.from(rest.replace(/\r?\n$/, ""), "utf8");
  return { headers, body, parts: [] };
}

/** Every leaf part, depth first. */
export function leaves(p: MimePart): MimePart[] {
  return p.parts.length ? p.parts.flatMap(leaves) : [p];
}

export function attachment(p: MimePart, fileName: string): MimePart | undefined {
  return leaves(p).find((x) => (x.headers["content-disposition"] ?? "").includes(fileName));
}
