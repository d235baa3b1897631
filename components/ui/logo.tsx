// Rustline's mark: a jar outline with a humidity line and one rust spot.
export function LogoMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <rect x="7" y="3" width="18" height="4" rx="1.5" fill="#4a525c" />
      <path d="M8 8h16v17a4 4 0 0 1-4 4h-8a4 4 0 0 1-4-4z" fill="none" stroke="#25937f" strokeWidth="2" />
      <path d="M9 17c2.3-1.4 4.7-1.4 7 0s4.7 1.4 7 0" fill="none" stroke="#6ecbb7" strokeWidth="1.6" />
      <circle cx="19.5" cy="23" r="2.6" fill="#c95b1f" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2 font-semibold tracking-tight text-lg">
      <LogoMark />
      Rustline
    </span>
  );
}
