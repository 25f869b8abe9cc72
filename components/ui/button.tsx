import type { ButtonHTMLAttributes } from "react";

type Tone = "primary" | "secondary" | "danger" | "quiet";

const TONES: Record<Tone, string> = {
  primary: "bg-kerf text-white hover:bg-kerf-dark disabled:bg-ink-faint",
  secondary: "bg-paper-raised text-ink border border-bead-strong hover:bg-paper-sunk",
  danger: "bg-ember text-white hover:brightness-110",
  quiet: "text-kerf hover:bg-kerf-light",
};

export function buttonClass(tone: Tone = "primary", extra = "") {
  return `inline-flex min-h-11 items-center justify-center gap-2 rounded-md px-4 text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-70 ${TONES[tone]} ${extra}`;
}

export function Button({
  tone = "primary",
  className = "",
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { tone?: Tone }) {
  return <button type="button" className={buttonClass(tone, className)} {...rest} />;
}
