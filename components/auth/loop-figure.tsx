/**
 * A drawn transfer loop (output against input) of a hysteresis trigger, labelled with the
 * battery-disconnect demo's switching points. Decorative.
 */
export function LoopFigure({ className }: { className?: string }) {
  // Input axis 10.5…13.5 V → x 40…300; output low/high → y 150/40.
  const x = (v: number) => 40 + ((v - 10.5) / 3) * 260;
  const lo = 150;
  const hi = 40;
  const upper = x(12.5);
  const lower = x(11.4);
  return (
    <svg
      viewBox="0 0 320 190"
      className={className}
      role="img"
      aria-label="Hysteresis loop: the output switches high as the input rises past 12.5 V and low again as it falls below 11.4 V"
    >
      <g stroke="#d9ddd3" strokeWidth="1">
        {[11, 11.5, 12, 12.5, 13].map((v) => (
          <line key={v} x1={x(v)} y1="28" x2={x(v)} y2="160" />
        ))}
      </g>
      {/* output limits */}
      <g stroke="#9aa3b2" strokeDasharray="4 4" strokeWidth="1">
        <line x1="40" y1={hi} x2="300" y2={hi} />
        <line x1="40" y1={lo} x2="300" y2={lo} />
      </g>
      {/* deadband */}
      <rect x={lower} y={hi} width={upper - lower} height={lo - hi} fill="#e2eddb" opacity="0.7" />
      <g stroke="#4d7a3a" strokeWidth="1.2">
        <line x1={lower} y1="28" x2={lower} y2="160" />
        <line x1={upper} y1="28" x2={upper} y2="160" />
      </g>
      {/* the loop itself */}
      <path
        d={`M40 ${lo} H${upper} V${hi} H300 M300 ${hi} H${lower} V${lo}`}
        fill="none"
        stroke="#b5562a"
        strokeWidth="2.4"
        strokeLinejoin="round"
      />
      <g fill="#b5562a">
        <path d={`M${upper - 5} ${(lo + hi) / 2 + 6} l5 -10 l5 10 z`} />
        <path d={`M${lower - 5} ${(lo + hi) / 2 - 6} l5 10 l5 -10 z`} />
        <path d={`M${x(11.9) - 6} ${lo - 5} l10 5 l-10 5 z`} />
        <path d={`M${x(12) + 6} ${hi - 5} l-10 5 l10 5 z`} />
      </g>
      <g fontFamily="var(--font-jb), monospace" fontSize="10" fill="#3b4556">
        <text x={lower} y="176" textAnchor="middle">
          11.4 V
        </text>
        <text x={upper} y="176" textAnchor="middle">
          12.5 V
        </text>
        <text x="36" y={hi + 3} textAnchor="end">
          high
        </text>
        <text x="36" y={lo + 3} textAnchor="end">
          low
        </text>
      </g>
      <g fontFamily="var(--font-plex), sans-serif" fontSize="10" fill="#6b7587">
        <text x={(lower + upper) / 2} y="22" textAnchor="middle">
          deadband
        </text>
        <text x="300" y="188" textAnchor="end">
          input →
        </text>
      </g>
    </svg>
  );
}
