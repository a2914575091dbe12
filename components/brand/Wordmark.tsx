/** Cloche's mark: a bell jar over a seedling. */
export function ClocheMark({ className = "h-7 w-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <path d="M6 25 C6 14 10.5 7.5 16 7.5 S26 14 26 25" fill="none" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" />
      <circle cx="16" cy="5" r="2" fill="currentColor" />
      <path d="M3.5 25.5 H28.5" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" />
      <path d="M16 25 V18.5" stroke="#72a563" strokeWidth="1.8" strokeLinecap="round" />
      <path d="M16 20.5 C13.5 20.5 12.5 18.8 12.5 17 C14.8 17 16 18.4 16 20.5 Z" fill="#72a563" />
      <path d="M16 19.5 C18.5 19.5 19.5 17.6 19.5 15.8 C17.2 15.8 16 17.3 16 19.5 Z" fill="#72a563" />
    </svg>
  );
}

export function Wordmark({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 text-leaf-800 ${className}`.trim()}>
      <ClocheMark />
      <span className="text-lg font-semibold tracking-tight">Cloche</span>
    </span>
  );
}
