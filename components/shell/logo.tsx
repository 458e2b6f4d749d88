/** The Steamlane mark: three rising wisps above a lane. */
export function Logo({ className = "h-8 w-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect width="32" height="32" rx="9" fill="#0f5e63" />
      <path d="M9 19c0-3 3-3 3-6s-2-3-2-5" stroke="#f4f2ec" strokeWidth="2" fill="none" strokeLinecap="round" />
      <path d="M15 19c0-3 3-3 3-6s-2-3-2-5" stroke="#f4f2ec" strokeWidth="2" fill="none" strokeLinecap="round" />
      <path d="M21 19c0-3 3-3 3-6s-2-3-2-5" stroke="#d4731f" strokeWidth="2" fill="none" strokeLinecap="round" />
      <path d="M6 24h20" stroke="#f4f2ec" strokeWidth="2.5" strokeLinecap="round" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2">
      <Logo />
      <span className="text-lg font-semibold tracking-tight text-ink">Steamlane</span>
    </span>
  );
}
