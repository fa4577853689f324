import type { EndpointErrorResult, EndpointInsight } from '@shared/chemistry/tools/service';
import type { CurveSeries } from '@/components/charts/TitrationChart.vue';

/** Shared wording and chart data of curve insight (the Tools page and the bench Curve view). */
export const kindLabel = { phenolphthalein: 'P (phenolphthalein)', total: 'T (total)' } as const;
export const eqLabel = { carbonate: 'Carbonate (P)', total: 'Total (T)', mineral: 'Mineral' } as const;

export const steepBand = (e: EndpointInsight) =>
  e.steep
    ? { level: 'ok' as const, label: 'On the steep part', meaning: 'Slope at least 75 % of its peak' }
    : { level: 'caution' as const, label: 'Off the steep part', meaning: 'Slope under 75 % of its peak: a misread pH moves the volume more' };

export const signed = (v: number | null, d: number) => (v === null ? '—' : `${v > 0 ? '+' : ''}${v.toFixed(d)}`);

// Indicator bands: light tints of each indicator's own colour change, labelled in the legend.
const bandTint: Record<string, string> = {
  phenolphthalein: 'rgba(214, 51, 132, 0.13)',
  bromcresol_green_methyl_red: 'rgba(46, 139, 87, 0.14)',
  methyl_orange: 'rgba(230, 126, 34, 0.15)',
};

/** The model curve, true equivalence points, fixed endpoints and indicator bands; `measured` readings drawn beside the model. */
export function insightChart(res: EndpointErrorResult, measured?: { volumeMl: number; pH: number }[]) {
  const applicable = res.endpoints.filter((e) => e.applicable && e.endpointVolumeMl !== null);
  const series: CurveSeries[] = [
    ...(measured?.length ? [{ label: 'Measured readings', points: measured, color: '#1f6f78' }] : []),
    { label: 'Model curve', points: res.curve.points, showPoints: false, ...(measured?.length ? { color: '#8a6d1d', dashed: true } : {}) },
    ...res.equivalencePoints.map((p) => ({
      label: `True ${p.name} equivalence: ${p.volumeMl.toFixed(3)} mL, pH ${p.pH.toFixed(2)}`,
      points: [
        { volumeMl: p.volumeMl, pH: 0 },
        { volumeMl: p.volumeMl, pH: 14 },
      ],
      color: '#334155',
      dashed: true,
      showPoints: false,
    })),
  ];
  return {
    series,
    derivative: measured?.length ? undefined : res.curve.derivative,
    endpointPh: applicable.map((e) => ({ pH: e.endpointPh, label: `Fixed endpoint pH ${e.endpointPh}` })),
    endpoints: applicable.map((e) => ({ volumeMl: e.endpointVolumeMl as number, pH: e.endpointPh, label: `pH ${e.endpointPh}` })),
    bands: res.indicators.map((i) => ({ from: i.fromPh, to: i.toPh, label: `${i.name} ${i.fromPh}–${i.toPh}`, color: bandTint[i.key] })),
  };
}
