// Halflight's mark: a decay curve falling through half its height, drawn in a square cell.
export function Mark({ size = 36 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 36 36" aria-hidden="true" className="shrink-0">
      <rect x="1" y="1" width="34" height="34" rx="5" className="fill-quartz-700" />
      <path d="M6 8 C 12 22, 20 27, 30 28" fill="none" stroke="white" strokeWidth="2.4" strokeLinecap="round" />
      <line x1="6" y1="18" x2="30" y2="18" stroke="white" strokeOpacity="0.45" strokeWidth="1.2" strokeDasharray="2 2" />
    </svg>
  );
}
