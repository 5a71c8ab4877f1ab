/**
 * Fringelog's mark: Newton's rings seen from a corner. Ring radii grow as √n, as the dark
 * fringes between a lens and a flat do (r = √(nλR); Hecht, Optics, ch. 9 — from memory).
 */
const RADII = [1, 2, 3, 4, 5, 6, 7].map((n) => 9.2 * Math.sqrt(n));

export function LogoMark({ size = 32, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" role="img" aria-label="Fringelog" className={className}>
      <defs>
        <clipPath id="fringelog-mark-clip">
          <rect x="0" y="0" width="32" height="32" rx="7" />
        </clipPath>
      </defs>
      <g clipPath="url(#fringelog-mark-clip)">
        <rect x="0" y="0" width="32" height="32" fill="#17202b" />
        {RADII.map((r, i) => (
          <circle key={r} cx="4" cy="28" r={r} fill="none" stroke={i % 2 === 0 ? '#5fb3b3' : '#c77aa6'} strokeWidth={2.6 - i * 0.22} />
        ))}
        <circle cx="4" cy="28" r="4.2" fill="#f6ead2" />
      </g>
    </svg>
  );
}

export function Wordmark({ onDark = false, className }: { onDark?: boolean; className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className ?? ''}`}>
      <LogoMark size={28} className={onDark ? 'rounded-[7px] ring-1 ring-white/25' : undefined} />
      <span className="text-lg font-semibold tracking-tight">
        Fringe<span className={onDark ? 'text-[#8fd0cc]' : 'text-fringe'}>log</span>
      </span>
    </span>
  );
}
