import type { Reading } from '@shared/chemistry/endpoints';

/**
 * Synthetic titration: 100.00 mL, true alkalinity 2.500 meq/L (125.0 mg/L with 50,000), start
 * pH 9.20, 25 °C, closed system, ideal solution, 0.02000 N strong acid; pH rounded to 0.01 as a
 * meter shows it. Computed from the closed-system charge balance (Stumm and Morgan) with
 * Plummer and Busenberg 1982 constants; exact equivalences 0.8685 mL (pH 8.32) and 12.500 mL
 * (pH 4.52).
 */
export const SYNTHETIC_TITRATION: Reading[] = (
  [
    [0.0, 9.2], [0.25, 9.05], [0.5, 8.85], [0.75, 8.52], [1.0, 8.1], [1.25, 7.78], [1.5, 7.58], [1.75, 7.43],
    [2.0, 7.31], [3.0, 7.0], [4.0, 6.79], [5.0, 6.61], [6.0, 6.45], [7.0, 6.3], [8.0, 6.15], [9.0, 5.99],
    [10.0, 5.79], [10.25, 5.73], [10.5, 5.67], [10.75, 5.6], [11.0, 5.53], [11.25, 5.44], [11.5, 5.34],
    [11.75, 5.21], [12.0, 5.05], [12.25, 4.82], [12.5, 4.52], [12.75, 4.22], [13.0, 4.01], [13.25, 3.86],
    [13.5, 3.74], [13.75, 3.65], [14.0, 3.57], [14.5, 3.45], [15.0, 3.36], [15.5, 3.28], [16.0, 3.22],
    [16.5, 3.16], [17.0, 3.11],
  ] as const
).map(([volumeMl, pH]) => ({ volumeMl, pH }));

export const SYNTHETIC = { sampleVolumeMl: 100, titrantNormality: 0.02, alkalinityEqL: 2.5e-3, initialPh: 9.2 } as const;
