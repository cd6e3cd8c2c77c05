// A schematic section of one cylinder at top dead centre, drawn from the package's
// numbers: barrel (bore), head chamber, gasket, piston crown with dome or dish, rod and
// crank throw (stroke). Lengths are to scale; deck and gasket are drawn six times
// thicker so they can be read. Missing figures are drawn at typical sizes, dashed. Each
// label sits beside the part it names: bore across the barrel's top, rod along the rod,
// stroke beside the crank pin's circle.
import type { Resolved } from "~/lib/bench/spec";
import { fmtLine, type Units } from "~/lib/bench/units";

const S = 1.1; // px per mm
const THIN = 6; // deck and gasket exaggeration
const W = 240;
const CX = W / 2;

export interface SectionNumbers {
  fields: Resolved;
  deckClearanceMm: number | null;
  units: Units;
}

export function EngineSection({ fields, deckClearanceMm, units }: SectionNumbers) {
  const known = (v: number | null, typical: number) => ({ v: v ?? typical, typical: v === null });
  const bore = known(fields.boreMm.value, 101.6);
  const stroke = known(fields.strokeMm.value, 111.1);
  const rod = known(fields.rodLengthMm.value, Math.max(165, (stroke.v / 2) * 3));
  const gBore = known(fields.gasketBoreMm.value, bore.v + 1.5);
  const gThick = known(fields.gasketThicknessMm.value, 1.0);
  const deck = known(deckClearanceMm, 0.25);
  const dome = fields.pistonDomeCc.value ?? 0;
  const chamber = known(fields.chamberCc.value, 85);

  const b = bore.v * S;
  const area = (Math.PI / 4) * bore.v * bore.v; // mm²
  const chamberDepth = Math.min(((chamber.v * 1000) / area) * 1.6, 30) * S;
  const domeH = Math.max(-14, Math.min(((dome * 1000) / area) * 2.5, 14)) * S;
  const gt = Math.max(gThick.v * THIN * S, 1.5);
  const dk = deck.v * THIN * S;

  const headTop = 26; // room above the head for the bore's dimension line
  const gasketTop = headTop + 22 + chamberDepth;
  const deckY = gasketTop + gt;
  const crownY = deckY + dk;
  const pistonH = bore.v * 0.42 * S;
  const pinY = crownY + pistonH * 0.45;
  const crankPinY = pinY + rod.v * S;
  const throwR = (stroke.v / 2) * S;
  const crankY = crankPinY + throwR;
  const wheelR = throwR + 20;
  const height = Math.ceil(crankY + wheelR + 34);
  const wall = 12;
  const barrelBottom = crownY + pistonH + stroke.v * S * 0.55;
  const gasketIntrudes = gBore.v < bore.v;
  const gb = gBore.v * S;

  const label = `Section of one cylinder: bore ${fmtLine(bore.v, "length", units)}, stroke ${fmtLine(stroke.v, "length", units)}, rod ${fmtLine(rod.v, "length", units)}, deck ${fmtLine(deck.v, "length", units)}, gasket ${fmtLine(gThick.v, "length", units)}${dome ? `, ${dome > 0 ? "dome" : "dish"} ${fmtLine(Math.abs(dome), "smallVolume", units)}` : ""}. Drawn to scale, except deck clearance and gasket, drawn ${THIN} times thicker.`;

  return (
    <svg
      viewBox={`0 0 ${W} ${height}`}
      role="img"
      aria-label={label}
      className="h-auto w-full max-w-[260px]"
      data-testid="engine-section"
    >
      <rect x="0" y="0" width={W} height={height} rx="6" fill="#0d1b2a" />
      {/* head with its chamber */}
      <path
        d={`M ${CX - b / 2 - wall - 10} ${headTop} H ${CX + b / 2 + wall + 10} V ${gasketTop} H ${CX + b / 2} Q ${CX} ${gasketTop - chamberDepth * 2} ${CX - b / 2} ${gasketTop} H ${CX - b / 2 - wall - 10} Z`}
        fill="#46525e"
        stroke="#c5ced8"
        strokeDasharray={chamber.typical ? "3 3" : undefined}
        data-testid="section-head"
      />
      {/* gasket: the inner edge sits at the gasket bore; red when it reaches into the bore */}
      {[-1, 1].map((side) => (
        <rect
          key={side}
          x={side < 0 ? CX - b / 2 - wall - 10 : CX + Math.min(gb, b + 40) / 2}
          y={gasketTop}
          width={Math.max(wall + 10 + (b - Math.min(gb, b + 40)) / 2, 2)}
          height={gt}
          fill={gasketIntrudes ? "#c2362f" : "#d89614"}
          opacity={gThick.typical ? 0.5 : 1}
          data-testid={side < 0 ? "section-gasket" : undefined}
        />
      ))}
      {/* barrel walls */}
      <rect
        x={CX - b / 2 - wall}
        y={deckY}
        width={wall}
        height={barrelBottom - deckY}
        fill="#9aa7b4"
        opacity={bore.typical ? 0.5 : 1}
      />
      <rect
        x={CX + b / 2}
        y={deckY}
        width={wall}
        height={barrelBottom - deckY}
        fill="#9aa7b4"
        opacity={bore.typical ? 0.5 : 1}
      />
      {/* piston at TDC, dome above the crown or dish below it */}
      <path
        d={`M ${CX - b / 2 + 1} ${crownY} Q ${CX} ${crownY - domeH * 2} ${CX + b / 2 - 1} ${crownY} V ${crownY + pistonH} H ${CX - b / 2 + 1} Z`}
        fill="#e3e8ee"
        stroke="#f4f6f8"
        data-testid="section-piston"
      />
      <rect x={CX - b / 2 + 1} y={crownY + 5} width={b - 2} height="2" fill="#9aa7b4" />
      <rect x={CX - b / 2 + 1} y={crownY + 10} width={b - 2} height="2" fill="#9aa7b4" />
      {/* rod and crank throw */}
      <line
        x1={CX}
        y1={pinY}
        x2={CX}
        y2={crankPinY}
        stroke="#c5ced8"
        strokeWidth="10"
        strokeLinecap="round"
        strokeDasharray={rod.typical ? "6 4" : undefined}
        data-testid="section-rod"
      />
      <circle cx={CX} cy={pinY} r="5" fill="#0d1b2a" stroke="#f4f6f8" strokeWidth="2" />
      <circle
        cx={CX}
        cy={crankY}
        r={wheelR}
        fill="none"
        stroke="#6b7886"
        strokeWidth="6"
        strokeDasharray={stroke.typical ? "6 4" : undefined}
      />
      <circle
        cx={CX}
        cy={crankY}
        r={throwR}
        fill="none"
        stroke="#0f8b8d"
        strokeWidth="1.5"
        strokeDasharray="4 3"
        data-testid="section-throw"
      />
      <circle cx={CX} cy={crankPinY} r="7" fill="#0f8b8d" />
      <circle cx={CX} cy={crankY} r="5" fill="#f4f6f8" />
      {/* dimension lines */}
      <g
        fill="#f4f6f8"
        fontSize="9"
        fontFamily="inherit"
        stroke="#0d1b2a"
        strokeWidth="3"
        paintOrder="stroke"
        strokeLinejoin="round"
      >
        {/* bore: across the barrel, above the head */}
        <line
          x1={CX - b / 2}
          y1={16}
          x2={CX + b / 2}
          y2={16}
          stroke="#f4f6f8"
          strokeWidth="0.8"
          paintOrder="normal"
        />
        {[CX - b / 2, CX + b / 2].map((x) => (
          <line
            key={x}
            x1={x}
            y1={12}
            x2={x}
            y2={headTop + 4}
            stroke="#f4f6f8"
            strokeWidth="0.8"
            paintOrder="normal"
          />
        ))}
        <text x={CX} y={12} textAnchor="middle" data-testid="label-bore">
          bore {fmtLine(bore.v, "length", units)}
        </text>
        {/* rod: along the rod, between the pins */}
        <text x={CX + 9} y={(pinY + crankPinY) / 2} data-testid="label-rod">
          rod {fmtLine(rod.v, "length", units)}
        </text>
        {/* stroke: the crank pin's circle is the stroke across */}
        <line
          x1={W - 12}
          y1={crankY - throwR}
          x2={W - 12}
          y2={crankY + throwR}
          stroke="#0f8b8d"
          strokeWidth="1"
          paintOrder="normal"
        />
        {[crankY - throwR, crankY + throwR].map((y) => (
          <line
            key={y}
            x1={CX}
            y1={y}
            x2={W - 8}
            y2={y}
            stroke="#0f8b8d"
            strokeWidth="0.6"
            strokeDasharray="2 2"
            paintOrder="normal"
          />
        ))}
        <text
          x={W - 15}
          y={crankY}
          textAnchor="middle"
          transform={`rotate(-90 ${W - 15} ${crankY})`}
          data-testid="label-stroke"
        >
          stroke {fmtLine(stroke.v, "length", units)}
        </text>
        <text x={8} y={height - 18} fill="#c5ced8" data-testid="label-scale">
          To scale, except deck clearance and
        </text>
        <text x={8} y={height - 7} fill="#c5ced8">
          gasket: drawn {THIN} times thicker to be seen.
        </text>
      </g>
    </svg>
  );
}
