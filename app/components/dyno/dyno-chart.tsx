// Power and torque against rpm for the runs shown: power solid on the right axis, torque
// dashed on the left, each run in its colour, its peaks marked. recharts is imported only
// here, and this component only by the dyno route, so no other page loads it.
import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceArea,
  ReferenceDot,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { Series } from "./series";

export function DynoChart({
  series,
  torqueUnit,
  powerUnit,
  band,
}: {
  series: Series[];
  torqueUnit: string;
  powerUnit: string;
  band: { from: number; to: number } | null;
}) {
  const rpms = series.flatMap((s) => s.points.map((p) => p.rpm));
  const min = Math.floor(Math.min(...rpms) / 500) * 500;
  const max = Math.ceil(Math.max(...rpms) / 500) * 500;
  return (
    <figure
      aria-label={`Power (${powerUnit}) and torque (${torqueUnit}) against engine speed (rpm)`}
    >
      <div className="h-[380px] w-full" data-testid="dyno-chart">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 12, right: 12, bottom: 28, left: 8 }}>
            <CartesianGrid stroke="#e3e8ee" />
            <XAxis
              type="number"
              dataKey="rpm"
              domain={[min, max]}
              tickCount={8}
              allowDuplicatedCategory={false}
              label={{ value: "Engine speed (rpm)", position: "insideBottom", offset: -16 }}
            />
            <YAxis
              yAxisId="torque"
              orientation="left"
              label={{
                value: `Torque (${torqueUnit})`,
                angle: -90,
                position: "insideLeft",
                offset: 10,
              }}
            />
            <YAxis
              yAxisId="power"
              orientation="right"
              label={{
                value: `Power (${powerUnit})`,
                angle: 90,
                position: "insideRight",
                offset: 10,
              }}
            />
            <Tooltip
              formatter={(v) => (typeof v === "number" ? v.toFixed(1) : String(v))}
              labelFormatter={(rpm) => `${rpm} rpm`}
            />
            {band ? (
              <ReferenceArea
                yAxisId="power"
                x1={band.from}
                x2={band.to}
                fill="#0f8b8d"
                fillOpacity={0.08}
              />
            ) : null}
            {series.flatMap((s) => [
              <Line
                key={`${s.key}-p`}
                yAxisId="power"
                data={s.points}
                dataKey="power"
                name={`${s.name} power`}
                stroke={s.color}
                strokeWidth={s.basis === "observed" ? 1.5 : 2.5}
                strokeOpacity={s.basis === "observed" ? 0.55 : 1}
                dot={false}
                isAnimationActive={false}
              />,
              <Line
                key={`${s.key}-t`}
                yAxisId="torque"
                data={s.points}
                dataKey="torque"
                name={`${s.name} torque`}
                stroke={s.color}
                strokeDasharray="6 4"
                strokeWidth={s.basis === "observed" ? 1.5 : 2}
                strokeOpacity={s.basis === "observed" ? 0.55 : 1}
                dot={false}
                isAnimationActive={false}
              />,
            ])}
            {series
              .filter((s) => s.basis !== "observed")
              .flatMap((s) => [
                s.peakPower ? (
                  <ReferenceDot
                    key={`${s.key}-pp`}
                    yAxisId="power"
                    x={s.peakPower.rpm}
                    y={s.peakPower.value}
                    r={5}
                    fill={s.color}
                    stroke="#fff"
                  />
                ) : null,
                s.peakTorque ? (
                  <ReferenceDot
                    key={`${s.key}-pt`}
                    yAxisId="torque"
                    x={s.peakTorque.rpm}
                    y={s.peakTorque.value}
                    r={5}
                    fill="#fff"
                    stroke={s.color}
                    strokeWidth={2}
                  />
                ) : null,
              ])}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-sm" aria-label="Curves drawn">
        {series.map((s) => (
          <li key={s.key} className="flex items-center gap-1">
            <svg width="28" height="8" aria-hidden="true">
              <line
                x1="0"
                y1="4"
                x2="28"
                y2="4"
                stroke={s.color}
                strokeWidth="3"
                opacity={s.basis === "observed" ? 0.55 : 1}
              />
            </svg>
            {s.name}
          </li>
        ))}
      </ul>
      <figcaption className="mt-1 text-sm text-steel-700">
        Solid lines: power ({powerUnit}, right axis). Dashed: torque ({torqueUnit}, left axis).
        Filled dot: peak power; open dot: peak torque. Faint lines: observed, before correction.
      </figcaption>
    </figure>
  );
}
