// Pinchpoint's mark: two flows narrowing to one point — the place the estate pinches.
export function Logo({ size = 28, withName = true }: { size?: number; withName?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2">
      <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true">
        <path d="M3 4h26L18.2 15.2a3 3 0 0 1-4.4 0z" fill="var(--pp-brass)" />
        <path d="M3 28h26L18.2 16.8a3 3 0 0 0-4.4 0z" fill="var(--pp-brass)" opacity="0.55" />
        <circle cx="16" cy="16" r="2.2" fill="var(--pp-ink)" />
      </svg>
      {withName && <span className="text-lg font-semibold tracking-tight">Pinchpoint</span>}
    </span>
  );
}
