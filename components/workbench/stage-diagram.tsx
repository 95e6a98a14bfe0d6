// The stage drawn from its numbers: a generated diagram (not an editor) in the Railwise style —
// graphite wires, resistors as rounded bars with the value beneath, input in indigo, output in
// copper, the reference as a moss tab. Pure SVG, server- and client-safe.
import type { Scenario } from "@/lib/schemas/scenario";
import { formatQuantity } from "@/lib/design/notation";
import { STAGE_KIND_LABEL, STAGE_ROLE_LABEL } from "@/lib/workbench/stage-labels";

const INK = "#3b4556";
const MUTE = "#6b7587";
const INDIGO = "#3b4fa8";
const COPPER = "#b5562a";
const MOSS = "#4d7a3a";

type Pt = [number, number];

function Wire({ pts, color = INK }: { pts: Pt[]; color?: string }) {
  return (
    <polyline
      points={pts.map((p) => p.join(",")).join(" ")}
      fill="none"
      stroke={color}
      strokeWidth={1.6}
      strokeLinejoin="round"
    />
  );
}

function Dot({ at }: { at: Pt }) {
  return <circle cx={at[0]} cy={at[1]} r={3} fill={INK} />;
}

const DIAGRAM_LABEL: Record<string, string> = {
  ...Object.fromEntries(Object.entries(STAGE_ROLE_LABEL).map(([k, v]) => [k, v.name])),
  rTop: "R top",
  rBottom: "R bottom",
};

/** Horizontal or vertical resistor centred on `c`, 46 × 14, label and value outside it. */
function Resistor({ c, vertical = false, role, ohms }: { c: Pt; vertical?: boolean; role: string; ohms: number }) {
  const [x, y] = c;
  const w = vertical ? 14 : 46;
  const h = vertical ? 46 : 14;
  const value = formatQuantity(ohms, "Ω", 3);
  // The label the Stage tab gives the part; the divider's two ends are "R top" and "R bottom".
  const label = DIAGRAM_LABEL[role] ?? role;
  return (
    <g data-role={role}>
      <rect x={x - w / 2} y={y - h / 2} width={w} height={h} rx={4} fill="#eceee8" stroke={INK} strokeWidth={1.4} />
      {vertical ? (
        <>
          <text x={x + 12} y={y - 4} fontSize={12.5} fill={MUTE} fontFamily="var(--font-plex), sans-serif">
            {label}
          </text>
          <text x={x + 12} y={y + 12} fontSize={13.5} fill={INK} fontFamily="var(--font-jb), monospace">
            {value}
          </text>
        </>
      ) : (
        <>
          <text
            x={x}
            y={y - 12}
            fontSize={12.5}
            fill={MUTE}
            textAnchor="middle"
            fontFamily="var(--font-plex), sans-serif"
          >
            {label}
          </text>
          <text x={x} y={y + 24} fontSize={13.5} fill={INK} textAnchor="middle" fontFamily="var(--font-jb), monospace">
            {value}
          </text>
        </>
      )}
    </g>
  );
}

function Capacitor({ c, farads }: { c: Pt; farads: number }) {
  const [x, y] = c;
  return (
    <g data-role="cTiming">
      <line x1={x - 11} y1={y - 4} x2={x + 11} y2={y - 4} stroke={INK} strokeWidth={2.4} />
      <line x1={x - 11} y1={y + 4} x2={x + 11} y2={y + 4} stroke={INK} strokeWidth={2.4} />
      <text x={x + 16} y={y - 3} fontSize={12.5} fill={MUTE} fontFamily="var(--font-plex), sans-serif">
        {STAGE_ROLE_LABEL.cTiming.name}
      </text>
      <text x={x + 16} y={y + 13} fontSize={13.5} fill={INK} fontFamily="var(--font-jb), monospace">
        {formatQuantity(farads, "F", 3)}
      </text>
    </g>
  );
}

/** 0 V: a short bar with a shorter one below (our mark for the common return). */
function Common({ at }: { at: Pt }) {
  const [x, y] = at;
  return (
    <g>
      <line x1={x - 10} y1={y} x2={x + 10} y2={y} stroke={INK} strokeWidth={1.8} />
      <line x1={x - 5} y1={y + 4} x2={x + 5} y2={y + 4} stroke={INK} strokeWidth={1.8} />
      <text x={x + 14} y={y + 5} fontSize={11.5} fill={MUTE} fontFamily="var(--font-plex), sans-serif">
        0 V
      </text>
    </g>
  );
}

/** A terminal: open ring with a tag. `side` says where the tag goes. */
function Terminal({
  at,
  label,
  color,
  side,
}: {
  at: Pt;
  label: string;
  color: string;
  side: "left" | "right" | "below";
}) {
  const [x, y] = at;
  const tx = side === "left" ? x - 8 : side === "right" ? x + 8 : x;
  const ty = side === "below" ? y + 18 : y + 4;
  const anchor = side === "left" ? "end" : side === "right" ? "start" : "middle";
  return (
    <g>
      <circle cx={x} cy={y} r={4.5} fill="#fff" stroke={color} strokeWidth={2} />
      <text
        x={tx}
        y={ty}
        fontSize={13}
        fontWeight={600}
        fill={color}
        textAnchor={anchor}
        fontFamily="var(--font-plex), sans-serif"
      >
        {label}
      </text>
    </g>
  );
}

/** The reference: a moss tab carrying its voltage (and its divider, when it has one). */
function Reference({
  at,
  volts,
  side = "left",
  divider,
}: {
  at: Pt;
  volts: number;
  side?: "left" | "below";
  divider?: string;
}) {
  const [x, y] = at;
  const text = divider ? `÷ ${divider} = ${formatQuantity(volts, "V", 4)}` : `ref ${formatQuantity(volts, "V", 4)}`;
  const w = 16 + text.length * 7.6;
  const bx = side === "left" ? x - w : x - w / 2;
  const by = side === "left" ? y - 11 : y + 2;
  return (
    <g data-role="reference">
      <rect x={bx} y={by} width={w} height={22} rx={11} fill="#e2eddb" stroke={MOSS} strokeWidth={1.3} />
      <text
        x={bx + w / 2}
        y={by + 15.5}
        fontSize={12.5}
        fill={MOSS}
        textAnchor="middle"
        fontFamily="var(--font-jb), monospace"
      >
        {text}
      </text>
    </g>
  );
}

/** Op-amp body: left edge at x0 from y0−50 to y0+50, apex at x0+80; "−" pin above, "+" below. */
function Amp({ x0, y0, supply }: { x0: number; y0: number; supply: Scenario["supply"] }) {
  const apex: Pt = [x0 + 80, y0];
  return (
    <g>
      <path
        d={`M${x0},${y0 - 50} L${apex[0]},${apex[1]} L${x0},${y0 + 50} Z`}
        fill="#fff"
        stroke={INK}
        strokeWidth={1.8}
        strokeLinejoin="round"
      />
      <text x={x0 + 8} y={y0 - 21} fontSize={14} fill={INK} fontFamily="var(--font-jb), monospace">
        −
      </text>
      <text x={x0 + 8} y={y0 + 31} fontSize={14} fill={INK} fontFamily="var(--font-jb), monospace">
        +
      </text>
      <line x1={x0 + 40} y1={y0 - 30} x2={x0 + 40} y2={y0 - 44} stroke={MUTE} strokeWidth={1.2} />
      <text x={x0 + 44} y={y0 - 42} fontSize={11.5} fill={MUTE} fontFamily="var(--font-jb), monospace">
        {formatQuantity(supply.positive, "V", 3)}
      </text>
      <line x1={x0 + 40} y1={y0 + 30} x2={x0 + 40} y2={y0 + 44} stroke={MUTE} strokeWidth={1.2} />
      <text x={x0 + 44} y={y0 + 50} fontSize={11.5} fill={MUTE} fontFamily="var(--font-jb), monospace">
        {formatQuantity(supply.negative, "V", 3)}
      </text>
    </g>
  );
}

/** The circuit as built around the stage, one short line each (drawn under the network). */
function asBuiltLines(
  scenario: Pick<Scenario, "stage" | "supply"> & Partial<Pick<Scenario, "source" | "filter" | "output">>,
): string[] {
  const lines: string[] = [];
  const ohm = (v: number) => formatQuantity(v, "Ω", 3);
  const s = scenario.source;
  if (s) {
    const what = s.quantity ? `${s.quantity} ` : "";
    if (s.sensor.kind === "divider")
      lines.push(`in: ${what}through a divider ${ohm(s.sensor.rTop)} / ${ohm(s.sensor.rBottom)} to 0 V`);
    else if (s.sensor.kind === "ntc")
      lines.push(
        `in: ${what}NTC ${"r25" in s.sensor.model ? ohm(s.sensor.model.r25) : ""} at the ${s.sensor.position} of a divider with ${ohm(s.sensor.rFixed)}`,
      );
    else
      lines.push(
        `in: ${what}linear sensor, ${formatQuantity(s.sensor.voltsPerUnit, "V", 3)} per ${s.unit ?? s.sensor.unit ?? "unit"}`,
      );
  }
  if (scenario.filter)
    lines.push(
      `RC filter before the input: ${ohm(scenario.filter.r)} in series, ${formatQuantity(scenario.filter.c, "F", 3)} to 0 V`,
    );
  const o = scenario.output;
  if (o?.kind === "open-drain")
    lines.push(
      `out: open drain, ${ohm(o.pullUp)} pull-up to ${typeof o.pullUpTo === "number" ? formatQuantity(o.pullUpTo, "V", 3) : "the positive supply"}${o.load ? `, load ${ohm(o.load.r)}` : ""}`,
    );
  return lines;
}

export function StageDiagram({
  scenario,
  className,
}: {
  scenario: Pick<Scenario, "stage" | "supply"> & Partial<Pick<Scenario, "source" | "filter" | "output">>;
  className?: string;
}) {
  const st = scenario.stage;
  const div = st.referenceDivider;
  const dividerText = div ? `${formatQuantity(div.rTop, "Ω", 3)}/${formatQuantity(div.rBottom, "Ω", 3)}` : undefined;
  const inLabel = scenario.source?.quantity ? scenario.source.quantity.slice(0, 14) : "in";
  const extra = asBuiltLines(scenario);
  const X0 = 290; // op-amp left edge
  const Y0 = 122;
  const NEG: Pt = [X0, Y0 - 25];
  const POS: Pt = [X0, Y0 + 25];
  const OUT: Pt = [X0 + 80, Y0];
  const ON: Pt = [460, Y0]; // output node
  const body: React.ReactNode[] = [];
  const push = (n: React.ReactNode) => body.push(<g key={body.length}>{n}</g>);

  // Output wire and terminal are common to every kind.
  push(<Wire pts={[OUT, [530, Y0]]} color={COPPER} />);
  push(<Terminal at={[534, Y0]} label="out" color={COPPER} side="below" />);

  switch (st.kind) {
    case "noninverting-amplifier": {
      push(<Wire pts={[[40, POS[1]], POS]} color={INDIGO} />);
      push(<Terminal at={[36, POS[1]]} label={inLabel} color={INDIGO} side="below" />);
      push(<Wire pts={[NEG, [240, NEG[1]], [240, 40], [ON[0], 40], ON]} />);
      push(<Dot at={[240, NEG[1]]} />);
      push(<Dot at={ON} />);
      push(<Resistor c={[350, 40]} role="rFeedback" ohms={st.rFeedback} />);
      push(
        <Wire
          pts={[
            [240, NEG[1]],
            [150, NEG[1]],
          ]}
        />,
      );
      push(<Resistor c={[190, NEG[1]]} role="rGround" ohms={st.rGround} />);
      push(<Reference at={[150, NEG[1]]} volts={st.reference} divider={dividerText} />);
      break;
    }
    case "inverting-amplifier": {
      push(
        <Wire
          pts={[
            [40, NEG[1]],
            [240, NEG[1]],
          ]}
          color={INDIGO}
        />,
      );
      push(<Terminal at={[36, NEG[1]]} label={inLabel} color={INDIGO} side="below" />);
      push(<Resistor c={[150, NEG[1]]} role="rInput" ohms={st.rInput} />);
      push(<Wire pts={[[240, NEG[1]], NEG]} />);
      push(<Dot at={[240, NEG[1]]} />);
      push(<Wire pts={[[240, NEG[1]], [240, 40], [ON[0], 40], ON]} />);
      push(<Dot at={ON} />);
      push(<Resistor c={[350, 40]} role="rFeedback" ohms={st.rFeedback} />);
      push(<Wire pts={[POS, [240, POS[1]]]} />);
      push(<Reference at={[240, POS[1]]} volts={st.reference} divider={dividerText} />);
      break;
    }
    case "comparator": {
      const inPin = st.inputAt === "inverting" ? NEG : POS;
      const refPin = st.inputAt === "inverting" ? POS : NEG;
      push(<Wire pts={[[40, inPin[1]], inPin]} color={INDIGO} />);
      push(<Terminal at={[36, inPin[1]]} label={inLabel} color={INDIGO} side="below" />);
      push(<Wire pts={[refPin, [220, refPin[1]]]} />);
      push(<Reference at={[220, refPin[1]]} volts={st.reference} divider={dividerText} />);
      break;
    }
    case "schmitt-noninverting": {
      push(
        <Wire
          pts={[
            [40, POS[1]],
            [240, POS[1]],
          ]}
          color={INDIGO}
        />,
      );
      push(<Terminal at={[36, POS[1]]} label={inLabel} color={INDIGO} side="below" />);
      push(<Resistor c={[150, POS[1]]} role="rInput" ohms={st.rInput} />);
      push(<Wire pts={[[240, POS[1]], POS]} />);
      push(<Dot at={[240, POS[1]]} />);
      push(<Wire pts={[[240, POS[1]], [240, 210], [ON[0], 210], ON]} />);
      push(<Dot at={ON} />);
      push(<Resistor c={[350, 210]} role="rFeedback" ohms={st.rFeedback} />);
      push(<Wire pts={[NEG, [240, NEG[1]]]} />);
      push(<Reference at={[240, NEG[1]]} volts={st.reference} divider={dividerText} />);
      break;
    }
    case "schmitt-inverting":
    case "relaxation-oscillator": {
      if (st.kind === "schmitt-inverting") {
        push(<Wire pts={[[40, NEG[1]], NEG]} color={INDIGO} />);
        push(<Terminal at={[36, NEG[1]]} label={inLabel} color={INDIGO} side="below" />);
      } else {
        // v− is the timing capacitor, charged from the output through rTiming.
        push(<Wire pts={[NEG, [240, NEG[1]], [240, 40], [ON[0], 40], ON]} />);
        push(<Resistor c={[350, 40]} role="rTiming" ohms={st.rTiming} />);
        push(<Dot at={[240, NEG[1]]} />);
        push(
          <Wire
            pts={[
              [240, NEG[1]],
              [80, NEG[1]],
              [80, 112],
            ]}
          />,
        );
        push(<Capacitor c={[80, 116]} farads={st.cTiming} />);
        push(
          <Wire
            pts={[
              [80, 120],
              [80, 140],
            ]}
          />,
        );
        push(<Common at={[80, 140]} />);
      }
      push(<Wire pts={[POS, [240, POS[1]], [240, 210], [ON[0], 210], ON]} />);
      push(<Dot at={[240, POS[1]]} />);
      push(<Dot at={ON} />);
      push(<Resistor c={[350, 210]} role="rFeedback" ohms={st.rFeedback} />);
      push(
        <Wire
          pts={[
            [240, POS[1]],
            [150, POS[1]],
            [150, 175],
          ]}
        />,
      );
      if (div) {
        // The divider's two resistors meet v+ with rFeedback (no separate reference resistor).
        push(<Resistor c={[150, 197]} vertical role="rBottom" ohms={div.rBottom} />);
        push(
          <Wire
            pts={[
              [150, 219],
              [150, 228],
            ]}
          />,
        );
        push(<Common at={[150, 228]} />);
        push(
          <Wire
            pts={[
              [150, POS[1]],
              [150, 160],
              [100, 160],
              [100, 175],
            ]}
          />,
        );
        push(<Resistor c={[100, 197]} vertical role="rTop" ohms={div.rTop} />);
        push(
          <Wire
            pts={[
              [100, 219],
              [100, 226],
            ]}
          />,
        );
        push(
          <Terminal
            at={[100, 230]}
            label={`+${formatQuantity(scenario.supply.positive, "V", 3)}`}
            color={MOSS}
            side="left"
          />,
        );
      } else {
        push(<Resistor c={[150, 197]} vertical role="rReference" ohms={st.rReference} />);
        push(
          <Wire
            pts={[
              [150, 219],
              [150, 226],
            ]}
          />,
        );
        push(<Reference at={[150, 226]} volts={st.reference} side="below" />);
      }
      break;
    }
  }

  // Crop to what each kind draws: feedback above (amplifiers, oscillator) and/or below (triggers).
  const above =
    st.kind === "noninverting-amplifier" || st.kind === "inverting-amplifier" || st.kind === "relaxation-oscillator";
  const below =
    st.kind === "schmitt-noninverting" || st.kind === "schmitt-inverting" || st.kind === "relaxation-oscillator";
  const y0 = above ? 8 : 58;
  const yNet = below ? (st.kind === "schmitt-noninverting" ? 244 : 256) : 186;
  const y1 = yNet + extra.length * 17;
  return (
    <svg
      viewBox={`0 ${y0} 580 ${y1 - y0}`}
      role="img"
      aria-label={`Diagram: ${STAGE_KIND_LABEL[st.kind]}`}
      className={className}
      data-testid="stage-diagram"
      style={{ width: "100%", height: "auto", display: "block" }}
    >
      <defs>
        <pattern id="rw-grid" width="10" height="10" patternUnits="userSpaceOnUse">
          <path d="M10 0H0V10" fill="none" stroke="#eceee8" strokeWidth={0.6} />
        </pattern>
      </defs>
      <rect x={0} y={0} width={580} height={260 + extra.length * 17} fill="url(#rw-grid)" />
      {body}
      {extra.map((line, i) => (
        <text
          key={line}
          x={20}
          y={yNet + 12 + i * 17}
          fontSize={12.5}
          fill={INDIGO}
          fontFamily="var(--font-plex), sans-serif"
          data-role="as-built"
        >
          {line}
        </text>
      ))}
      <Amp x0={X0} y0={Y0} supply={scenario.supply} />
    </svg>
  );
}
