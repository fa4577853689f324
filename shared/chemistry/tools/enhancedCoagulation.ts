import type Decimal from 'decimal.js';
import { inputError } from '../../errors';
import { Dec, type DecimalValue } from '../decimal';

/**
 * Stage 1 D/DBP Rule, Step 1 required TOC removal [40 CFR 141.135(b)(2); the same table in
 * NH Env-Ws 382.23]. Rows by source-water TOC, columns by source-water alkalinity (mg/L as
 * CaCO3). Each range includes its upper limit and excludes its lower one ("> 2.0–4.0"), except
 * the first alkalinity column, which starts at 0 inclusive. TOC at or below 2.0 mg/L has no
 * Step 1 requirement.
 */

export type TocRow = 'toc_2_to_4' | 'toc_4_to_8' | 'toc_over_8';
export type AlkalinityColumn = 'alk_0_to_60' | 'alk_60_to_120' | 'alk_over_120';

export const TOC_ROWS: ReadonlyArray<{ key: TocRow; label: string; upper: number | null }> = [
  { key: 'toc_2_to_4', label: '> 2.0–4.0 mg/L', upper: 4.0 },
  { key: 'toc_4_to_8', label: '> 4.0–8.0 mg/L', upper: 8.0 },
  { key: 'toc_over_8', label: '> 8.0 mg/L', upper: null },
];

export const ALKALINITY_COLUMNS: ReadonlyArray<{ key: AlkalinityColumn; label: string; upper: number | null }> = [
  { key: 'alk_0_to_60', label: '0–60 mg/L', upper: 60 },
  { key: 'alk_60_to_120', label: '> 60–120 mg/L', upper: 120 },
  { key: 'alk_over_120', label: '> 120 mg/L', upper: null },
];

/** Required Step 1 TOC removal, %, [row][column] [40 CFR 141.135(b)(2)]. */
export const TOC_REMOVAL_PERCENT: Readonly<Record<TocRow, Readonly<Record<AlkalinityColumn, number>>>> = {
  toc_2_to_4: { alk_0_to_60: 35.0, alk_60_to_120: 25.0, alk_over_120: 15.0 },
  toc_4_to_8: { alk_0_to_60: 45.0, alk_60_to_120: 35.0, alk_over_120: 25.0 },
  toc_over_8: { alk_0_to_60: 50.0, alk_60_to_120: 40.0, alk_over_120: 30.0 },
};

/** Source TOC at or below which Step 1 sets no requirement: the rows start above 2.0 mg/L [40 CFR 141.135(b)(2)]. */
export const STEP1_MIN_TOC_MGL = 2.0;

export interface RequiredTocRemoval {
  /** Required removal, %; null when source TOC ≤ 2.0 mg/L (no Step 1 requirement). */
  requiredPercent: number | null;
  row: TocRow | null;
  column: AlkalinityColumn;
  /** Softening systems always use the > 120 column. */
  softening: boolean;
}

/** Step 1 required TOC removal from source TOC and alkalinity; softening uses the > 120 column [40 CFR 141.135(b)(2)]. */
export function requiredTocRemoval(input: { sourceTocMgL: number; sourceAlkalinity: number; softening?: boolean }): RequiredTocRemoval {
  const { sourceTocMgL, sourceAlkalinity } = input;
  const softening = input.softening ?? false;
  if (!(sourceTocMgL >= 0)) throw inputError('sourceTocMgL', 'must be 0 or more');
  if (!(sourceAlkalinity >= 0)) throw inputError('sourceAlkalinity', 'must be 0 or more');
  const column = softening
    ? 'alk_over_120'
    : ALKALINITY_COLUMNS.find((c) => c.upper === null || sourceAlkalinity <= c.upper)!.key;
  if (sourceTocMgL <= STEP1_MIN_TOC_MGL) return { requiredPercent: null, row: null, column, softening };
  const row = TOC_ROWS.find((r) => r.upper === null || sourceTocMgL <= r.upper)!.key;
  return { requiredPercent: TOC_REMOVAL_PERCENT[row][column], row, column, softening };
}

/** TOC removal achieved, % = (source − treated)/source × 100, in decimal [40 CFR 141.135(c)]. */
export function tocRemovalPercent(sourceTocMgL: DecimalValue, treatedTocMgL: DecimalValue): Decimal {
  const source = new Dec(sourceTocMgL);
  if (!source.gt(0)) throw inputError('sourceTocMgL', 'must be greater than 0 to compute a removal');
  return source.minus(treatedTocMgL).div(source).times(100);
}

/** Removal ratio = achieved % ÷ required %; its running annual average must be ≥ 1.00 [40 CFR 141.135(c), from memory]. */
export function removalRatio(achievedPercent: DecimalValue, requiredPercent: DecimalValue): Decimal {
  return new Dec(achievedPercent).div(requiredPercent);
}
