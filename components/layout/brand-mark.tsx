/**
 * Railwise's mark: one period of a sine whose crest and trough are cut flat by two rails —
 * a stage driven past its output limits. Drawn here so it ships with the app.
 */
export function BrandMark({ size = 22, className }: { size?: number; className?: string }) {
  return (
    <svg aria-hidden width={size} height={size} viewBox="0 0 24 24" className={className}>
      <line x1="1" y1="5" x2="23" y2="5" stroke="#9aa3b2" strokeWidth="1" />
      <line x1="1" y1="19" x2="23" y2="19" stroke="#9aa3b2" strokeWidth="1" />
      <path
        d="M1.5 12 C3 8 4 5 6 5 H8.5 C10.5 5 11 8.5 12 12 C13 15.5 13.5 19 15.5 19 H18 C20 19 21 16 22.5 12"
        fill="none"
        stroke="#b5562a"
        strokeWidth="2.2"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </svg>
  );
}

/** Mark + name, as used in the header and on the sign-in page. */
export function Wordmark({ size = 22, className }: { size?: number; className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className ?? ""}`}>
      <BrandMark size={size} />
      <span className="text-[17px] font-semibold tracking-tight text-ink">Railwise</span>
    </span>
  );
}
