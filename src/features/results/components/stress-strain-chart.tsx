import { CartesianGrid, Legend, Line, LineChart, ReferenceDot, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ChartView } from '../../../../shared/schemas/results';

const fmt = (n: number, digits: number) => n.toLocaleString('en-GB', { maximumFractionDigits: digits });

/**
 * Engineering stress against strain: the thinned curve (the server keeps every extreme), the
 * 0.2 % offset line, and Rp0.2, ReH and Rm marked with their values; values on hover.
 */
export function StressStrainChart({ chart }: { chart: ChartView }) {
  return (
    <figure className="rounded-lg border border-ink-200 bg-white p-3" data-testid="stress-strain-chart">
      <div className="h-80 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 24, right: 16, bottom: 24, left: 8 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d8dadf" />
            <XAxis type="number" dataKey="strainPct" domain={[0, 'dataMax']} tickFormatter={(v: number) => fmt(v, 2)} label={{ value: 'Strain, %', position: 'insideBottom', offset: -12 }} />
            <YAxis type="number" dataKey="stressMPa" domain={[0, 'auto']} tickFormatter={(v: number) => fmt(v, 0)} label={{ value: 'Stress, MPa', angle: -90, position: 'insideLeft' }} />
            <Tooltip
              formatter={(v) => [`${fmt(Number(v), 1)} MPa`, 'Stress']}
              labelFormatter={(v) => `Strain ${fmt(Number(v), 3)} %`}
            />
            <Legend verticalAlign="top" height={20} />
            <Line data={chart.points} dataKey="stressMPa" name="Record" stroke="#1f2937" strokeWidth={1.6} dot={false} isAnimationActive={false} />
            <Line data={chart.offsetLine} dataKey="stressMPa" name="0.2 % offset line" stroke="#b45309" strokeDasharray="6 4" dot={false} isAnimationActive={false} />
            {chart.marks.map((m) => (
              <ReferenceDot
                key={m.key}
                x={m.strainPct}
                y={m.stressMPa}
                r={5}
                fill={m.key === 'rm' ? '#1f2937' : '#b45309'}
                stroke="white"
                label={{ value: `${m.label} ${m.value}`, position: 'top', fontSize: 12 }}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-2 text-caption text-ink-500">
        {chart.points.length.toLocaleString('en-GB')} of {chart.originalPointCount.toLocaleString('en-GB')} points drawn; peaks and troughs are kept.{' '}
        {chart.marks.map((m) => `${m.label} ${m.value} at ${fmt(m.strainPct, 3)} %`).join(' · ')}
      </figcaption>
    </figure>
  );
}
