/** Blockyard's mark: a foam block in isometric view with a hot wire slicing a slab off its top. */
export function LogoMark({ size = 32, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 64 64" className={className} aria-hidden="true">
      {/* the block */}
      <path
        d="M32 22 L54 33 L54 51 L32 62 L10 51 L10 33 Z"
        fill="#f7f5ef"
        stroke="#1c2a2e"
        strokeWidth="3"
        strokeLinejoin="round"
      />
      <path
        d="M10 33 L32 44 L54 33 M32 44 L32 62"
        fill="none"
        stroke="#1c2a2e"
        strokeWidth="3"
        strokeLinejoin="round"
      />
      {/* the slab lifted off */}
      <path d="M32 4 L54 15 L32 26 L10 15 Z" fill="#d7ecee" stroke="#1f6c75" strokeWidth="3" strokeLinejoin="round" />
      {/* the hot wire */}
      <path d="M4 20.5 L60 20.5" stroke="#d2571f" strokeWidth="2.5" strokeLinecap="round" strokeDasharray="0.1 5" />
      <circle cx="4" cy="20.5" r="2.5" fill="#d2571f" />
      <circle cx="60" cy="20.5" r="2.5" fill="#d2571f" />
    </svg>
  );
}

export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className ?? ""}`}>
      <LogoMark size={30} />
      <span className="text-lg font-bold tracking-tight text-ink">
        Block<span className="text-kerf">yard</span>
      </span>
    </span>
  );
}
