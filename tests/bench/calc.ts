/**
 * Calculation throughput: a 60-reading curve (fixed-pH interpolation + inflection + Gran,
 * all computed by calculateAlkalinity) and the equilibrium speciation, in calls per second.
 */
import { calculateAlkalinity, calculateSpeciation } from '../../shared/chemistry/service.js';
import { modelCurve, carbonateWaterModel } from '../../shared/chemistry/curve.js';

export interface Rate {
  name: string;
  perSecond: number;
  iterations: number;
}

function rate(name: string, fn: () => void, seconds = 2): Rate {
  for (let i = 0; i < 200; i++) fn(); // warm up
  let iterations = 0;
  const end = performance.now() + seconds * 1000;
  const start = performance.now();
  while (performance.now() < end) {
    fn();
    iterations++;
  }
  return { name, perSecond: Math.round(iterations / ((performance.now() - start) / 1000)), iterations };
}

/** 60 readings from the model of a 125 mg/L water titrated with 0.02 N acid, rounded like a meter. */
export function sixtyReadings() {
  const model = carbonateWaterModel({ sampleVolumeMl: 100, titrant: 'acid', titrantNormality: 0.02, alkalinityEqL: 0.0025, initialPh: 9.2, temperatureC: 25 });
  const volumes = Array.from({ length: 60 }, (_, i) => Math.round(((i * 17) / 59) * 100) / 100);
  return modelCurve(model, volumes).map((p) => ({ volumeMl: p.volumeMl, pH: Math.round(p.pH * 100) / 100 }));
}

export function calcRates(): Rate[] {
  const readings = sixtyReadings();
  return [
    rate('60-reading curve: interpolation + inflection + Gran', () => {
      calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, readings });
    }),
    rate('equilibrium speciation (Plummer–Busenberg, Davies)', () => {
      calculateSpeciation({ pH: 8.5, temperatureC: 25, totalAlkalinity: 150, tdsMgL: 300 });
    }),
  ];
}
