/**
 * Block codes: what a label's QR code holds, how a scan is read back, and which codes a received
 * block may have. Shared by the label page and the handlers (server) and the scanner and the
 * delivery form (browser).
 *
 *   labelPayload("HF-1001")                                → "HF-1001"
 *   codeFromScan("https://yard.example/stock/HF-1001.2")   → "HF-1001.2"
 *   codeFromScan("/stock/hf-1001")                         → "HF-1001"
 *   codeFromScan("hello world")                            → null
 *   receivedCodeProblem("HF-1\u200b001")                   → 'Character 5 is a zero-width space: …'
 */
const CODE = /^[A-Za-z0-9][A-Za-z0-9._-]{0,39}$/;

/** A received block's code: plain letters, digits and "-". Offcut codes (`CODE.n`) are Blockyard's own. */
export const RECEIVED_CODE = /^[A-Za-z0-9][A-Za-z0-9-]{0,39}$/;
export const CODE_MAX = 40;

/** The plain code: short, so the printed modules are big enough to scan from arm's length. */
export function labelPayload(code: string): string {
  return code;
}

/** A block code from a scanned label: the bare code, a /stock/CODE path or a full URL to one. */
export function codeFromScan(text: string): string | null {
  let t = text.trim();
  if (/^https?:\/\//i.test(t)) {
    try {
      t = new URL(t).pathname;
    } catch {
      return null;
    }
  }
  const path = t.match(/^\/?stock\/([^/?#]+)\/?(?:[?#].*)?$/i);
  if (path) {
    try {
      t = decodeURIComponent(path[1]!);
    } catch {
      return null;
    }
  }
  return CODE.test(t) ? t.toUpperCase() : null;
}

// Characters people paste without seeing them, or mistake for others: named, not shown.
const NAMES: Record<number, string> = {
  9: "a tab",
  32: "a space",
  46: 'a full stop (".")',
  95: 'an underscore ("_")',
  47: 'a slash ("/")',
  160: "a no-break space",
  173: "a soft hyphen",
  847: "a combining grapheme joiner",
  1564: "an Arabic letter mark",
  4447: "a Hangul filler",
  6158: "a Mongolian vowel separator",
  8192: "an en quad space",
  8193: "an em quad space",
  8194: "an en space",
  8195: "an em space",
  8199: "a figure space",
  8201: "a thin space",
  8202: "a hair space",
  8203: "a zero-width space",
  8204: "a zero-width non-joiner",
  8205: "a zero-width joiner",
  8206: "a left-to-right mark",
  8207: "a right-to-left mark",
  8208: "a hyphen (‐, not the keyboard's -)",
  8209: "a non-breaking hyphen",
  8210: "a figure dash",
  8211: "an en dash (–)",
  8212: "an em dash (—)",
  8722: "a minus sign (−)",
  8232: "a line separator",
  8233: "a paragraph separator",
  8234: "a left-to-right embedding",
  8235: "a right-to-left embedding",
  8236: "a pop directional formatting mark",
  8237: "a left-to-right override",
  8238: "a right-to-left override",
  8239: "a narrow no-break space",
  8287: "a medium mathematical space",
  8288: "a word joiner",
  8294: "a left-to-right isolate",
  8295: "a right-to-left isolate",
  8296: "a first strong isolate",
  8297: "a pop directional isolate",
  12288: "an ideographic space",
  65279: "a zero-width no-break space (byte order mark)",
};

const hex = (cp: number) => `U+${cp.toString(16).toUpperCase().padStart(4, "0")}`;

/** A character as a person can recognise it: its name when it is invisible or a look-alike. */
export function describeCharacter(ch: string): string {
  const cp = ch.codePointAt(0)!;
  const named = NAMES[cp];
  if (named) return named;
  if (cp < 0x20 || (cp >= 0x7f && cp < 0xa0)) return `a control character (${hex(cp)})`;
  if (/\p{White_Space}/u.test(ch)) return `a space (${hex(cp)})`;
  if (/\p{Cf}|\p{Mn}|\p{Me}/u.test(ch)) return `an invisible character (${hex(cp)})`;
  if (/\p{L}/u.test(ch)) return `“${ch}” (${hex(cp)}), not a plain letter A–Z`;
  if (/\p{N}/u.test(ch)) return `“${ch}” (${hex(cp)}), not a plain digit 0–9`;
  return `“${ch}”`;
}

const ALLOWED = 'use letters, digits and "-" only.';

/**
 * Why `code` cannot be the code of a received block, or null when it can: 1–40 characters,
 * letters A–Z, digits and "-", starting with a letter or a digit. Positions count characters as a
 * person sees them, from 1.
 *
 *   receivedCodeProblem("HF-2001")     → null
 *   receivedCodeProblem("HF 2001")     → 'Character 3 is a space: use letters, digits and "-" only.'
 *   receivedCodeProblem("X.1")         → 'Character 2 is a full stop ("."): offcut codes (X.1) are made by Blockyard; …'
 */
export function receivedCodeProblem(code: string): string | null {
  if (RECEIVED_CODE.test(code)) return null;
  const chars = Array.from(code);
  if (!chars.length) return "Enter a code, or leave it blank for Blockyard to number the block.";
  for (let i = 0; i < chars.length; i++) {
    const ch = chars[i]!;
    if (/[A-Za-z0-9]/.test(ch)) continue;
    if (ch === "-") {
      if (i === 0) return `Character 1 is "-": a code starts with a letter or a digit.`;
      continue;
    }
    const what = describeCharacter(ch);
    if (ch === ".") {
      const base = chars.slice(0, i).join("") || "HF-1001";
      return `Character ${i + 1} is ${what}: offcut codes (${base}.1, ${base}.2, …) are made by Blockyard when a block is cut; ${ALLOWED}`;
    }
    return `Character ${i + 1} is ${what}: ${ALLOWED}`;
  }
  return `At most ${CODE_MAX} characters (this one has ${chars.length}).`;
}
