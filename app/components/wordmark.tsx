/** The Ringbatch mark: a ring of sample points around one shared batch. */
export function Wordmark({ className = "" }: { className?: string }) {
  const points = Array.from({ length: 8 }, (_, i) => {
    const angle = (i / 8) * 2 * Math.PI - Math.PI / 2;
    return { x: 16 + 11 * Math.cos(angle), y: 16 + 11 * Math.sin(angle) };
  });
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" width="28" height="28" aria-hidden="true">
        <circle cx="16" cy="16" r="11" fill="none" stroke="currentColor" strokeOpacity="0.45" strokeWidth="1.5" />
        {points.map((p, i) => (
          <circle key={i} cx={p.x} cy={p.y} r="2.4" fill="currentColor" />
        ))}
        <rect x="12" y="12" width="8" height="8" rx="1.5" fill="var(--color-ochre-300)" />
      </svg>
      <span className="text-xl">Ringbatch</span>
    </span>
  );
}
