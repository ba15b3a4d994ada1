export function Logo({ className = '' }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" className="size-7" aria-hidden>
        <rect width="32" height="32" rx="7" fill="#0d5c57" />
        <path d="M16 6a7 7 0 0 0-4 12.7V22h8v-3.3A7 7 0 0 0 16 6z" fill="#fef3c7" />
        <rect x="12" y="23.5" width="8" height="2.5" rx="1" fill="#fef3c7" />
      </svg>
      <span>Lumenproof</span>
    </span>
  );
}
