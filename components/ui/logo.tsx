export function Logo({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" className="h-7 w-7" aria-hidden>
        <rect width="32" height="32" rx="7" fill="#1e242c" />
        <path d="M6 22c4-10 8-12 12-6s6 4 8-4" fill="none" stroke="#f59e1b" strokeWidth="3" strokeLinecap="round" />
        <circle cx="26" cy="12" r="2.5" fill="#4fd1c5" />
      </svg>
      <span>
        Lap<span className="text-signal-500">bench</span>
      </span>
    </span>
  );
}
