import { describe, expect, it } from 'vitest';
import { removalRatio, requiredTocRemoval, tocRemovalPercent } from '@shared/chemistry/tools/enhancedCoagulation';
import { calculateTocRemoval } from '@shared/chemistry/tools/service';
import { InputError } from '@shared/errors';

describe('Step 1 required TOC removal, every cell (40 CFR 141.135(b)(2))', () => {
  it.each([
    // [source TOC mg/L, alkalinity mg/L as CaCO3, required %] — 40 CFR 141.135(b)(2) table
    [3.0, 30, 35.0],
    [3.0, 90, 25.0],
    [3.0, 150, 15.0],
    [6.0, 30, 45.0],
    [6.0, 90, 35.0],
    [6.0, 150, 25.0],
    [10.0, 30, 50.0],
    [10.0, 90, 40.0],
    [10.0, 150, 30.0],
  ])('TOC %f, alkalinity %f → %f % (40 CFR 141.135(b)(2))', (toc, alk, pct) => {
    expect(requiredTocRemoval({ sourceTocMgL: toc, sourceAlkalinity: alk }).requiredPercent).toBe(pct);
  });
});

describe('Step 1 table boundaries (40 CFR 141.135(b)(2); domain.md 8b′)', () => {
  it.each([
    // alkalinity columns: 0–60 (0 and 60.0 included), > 60–120 (120.0 included), > 120
    [5.0, 0, 'alk_0_to_60', 45.0],
    [5.0, 60.0, 'alk_0_to_60', 45.0],
    [5.0, 60.01, 'alk_60_to_120', 35.0],
    [5.0, 120.0, 'alk_60_to_120', 35.0],
    [5.0, 120.01, 'alk_over_120', 25.0],
  ])('TOC %f, alkalinity %f is in column %s → %f % (40 CFR 141.135(b)(2))', (toc, alk, column, pct) => {
    const r = requiredTocRemoval({ sourceTocMgL: toc, sourceAlkalinity: alk });
    expect(r.column).toBe(column);
    expect(r.requiredPercent).toBe(pct);
  });

  it.each([
    // TOC rows: > 2.0–4.0 (4.0 included), > 4.0–8.0 (8.0 included), > 8.0; ≤ 2.0 no requirement
    [0, null, null],
    [2.0, null, null],
    [2.01, 'toc_2_to_4', 35.0],
    [4.0, 'toc_2_to_4', 35.0],
    [4.01, 'toc_4_to_8', 45.0],
    [8.0, 'toc_4_to_8', 45.0],
    [8.01, 'toc_over_8', 50.0],
  ])('TOC %f (alkalinity 40) is in row %s → %s % (40 CFR 141.135(b)(2))', (toc, row, pct) => {
    const r = requiredTocRemoval({ sourceTocMgL: toc, sourceAlkalinity: 40 });
    expect(r.row).toBe(row);
    expect(r.requiredPercent).toBe(pct);
  });

  it('softening systems always use the > 120 column (40 CFR 141.135(b)(2))', () => {
    expect(requiredTocRemoval({ sourceTocMgL: 6.0, sourceAlkalinity: 30, softening: true })).toMatchObject({ column: 'alk_over_120', requiredPercent: 25.0 });
    expect(requiredTocRemoval({ sourceTocMgL: 10.0, sourceAlkalinity: 90, softening: true }).requiredPercent).toBe(30.0);
  });
});

describe('checks 8a–8c (40 CFR 141.135(b)(2), (c); domain.md)', () => {
  it('8a: TOC 5.2, alkalinity 85 → 35.0 %', () => {
    expect(calculateTocRemoval({ sourceTocMgL: 5.2, sourceAlkalinity: 85 }).requiredRemovalPercent).toBe(35.0);
  });

  it('8b: TOC 3.0, alk 45 → 35.0 %; TOC 9.1, alk 150 → 30.0 %', () => {
    expect(calculateTocRemoval({ sourceTocMgL: 3.0, sourceAlkalinity: 45 }).requiredRemovalPercent).toBe(35.0);
    expect(calculateTocRemoval({ sourceTocMgL: 9.1, sourceAlkalinity: 150 }).requiredRemovalPercent).toBe(30.0);
  });

  it('8c: raw 5.2, finished 3.1, alk 85 → removal 40.38 %, ratio 1.154 (computed from (5.2 − 3.1)/5.2 and ÷ 35.0)', () => {
    const r = calculateTocRemoval({ sourceTocMgL: 5.2, sourceAlkalinity: 85, treatedTocMgL: 3.1 });
    expect(r.achievedRemovalPercent).toBeCloseTo(40.38, 2);
    expect(r.removalRatio).toBeCloseTo(1.154, 3);
    expect(r.meetsStep1).toBe(true);
    expect(r.status?.level).toBe('ok');
    // Decimal arithmetic: 2.1/5.2 × 100 = 40.384615… exactly, with no binary residue.
    expect(r.exact.achievedRemovalPercent?.startsWith('40.3846153846153846153846')).toBe(true);
  });

  it('a removal ratio below 1.00 does not meet Step 1 (40 CFR 141.135(c)): 5.2 → 3.5 is 32.7 % of 35.0 %', () => {
    const r = calculateTocRemoval({ sourceTocMgL: 5.2, sourceAlkalinity: 85, treatedTocMgL: 3.5 });
    // (5.2 − 3.5)/5.2 = 32.69 %; 32.69/35 = 0.934
    expect(r.removalRatio).toBeCloseTo(0.934, 3);
    expect(r.meetsStep1).toBe(false);
  });

  it('decimal helpers: removal and ratio (40 CFR 141.135(c))', () => {
    expect(tocRemovalPercent('4.0', '3.0').toString()).toBe('25');
    expect(removalRatio('25', '35').toSignificantDigits(4).toString()).toBe('0.7143');
  });

  it('TOC at 2.0 sets no Step 1 requirement and says so; the ratio is then null (40 CFR 141.135(b)(2), (a)(2))', () => {
    const r = calculateTocRemoval({ sourceTocMgL: 2.0, sourceAlkalinity: 85, treatedTocMgL: 1.5 });
    expect(r.step1Applies).toBe(false);
    expect(r.removalRatio).toBeNull();
    expect(r.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['step1_not_required', 'alternative_compliance_possible']));
  });

  it('warns on a treated TOC above the source TOC (negative removal)', () => {
    const r = calculateTocRemoval({ sourceTocMgL: 5.0, sourceAlkalinity: 85, treatedTocMgL: 5.5 });
    expect(r.achievedRemovalPercent).toBeCloseTo(-10, 9);
    expect(r.warnings.map((w) => w.code)).toContain('negative_removal');
  });

  it('rejects a negative TOC and a removal from a source TOC of 0', () => {
    expect(() => calculateTocRemoval({ sourceTocMgL: -1, sourceAlkalinity: 85 })).toThrow(InputError);
    expect(() => calculateTocRemoval({ sourceTocMgL: 0, sourceAlkalinity: 85, treatedTocMgL: 0 })).toThrow(InputError);
  });
});
