import type { ButtonHTMLAttributes } from "react";

type Tone = "primary" | "secondary" | "danger" | "quiet";

const TONES: Record<Tone, string> = {
  primary: "bg-kerf text-white hover:bg-kerf-dark disabled:bg-ink-faint",
  secondary: "bg-paper-raised text-ink border border-bead-strong hover:bg-paper-sunk",
  danger: "bg-ember text-white hover:brightness-110",
  quiet: "text-kerf hover:bg-kerf-light",
};

export function buttonClass(tone: Tone = "primary", extra = "") {
  return `inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-md px-4 text-sm font-medium no-underline hover:no-underline transition-colors disabled:cursor-not-allowed disabled:opacity-70 ${TONES[tone]} ${extra}`;
}

/** The one link in a table row: a 44 px tall target that never wraps (a code is one word). */
export const rowLinkClass =
  "flex min-h-11 min-w-11 items-center whitespace-nowrap font-medium no-underline hover:underline";

export function Button({
  tone = "primary",
  className = "",
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { tone?: Tone }) {
  return <button type="button" className={buttonClass(tone, className)} {...rest} />;
}
