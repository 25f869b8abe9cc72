/**
 * What a block label's QR code holds, and how a scan is read back. Shared by the label page
 * (server) and the scanner (browser).
 *
 *   labelPayload("HF-1001")                                → "HF-1001"
 *   codeFromScan("https://yard.example/stock/HF-1001.2")   → "HF-1001.2"
 *   codeFromScan("/stock/hf-1001")                         → "HF-1001"
 *   codeFromScan("hello world")                            → null
 */
const CODE = /^[A-Za-z0-9][A-Za-z0-9._-]{0,39}$/;

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
