/**
 * Readings pasted from a spreadsheet or typed: one `volume, pH` pair a line, separated by
 * a tab, comma, semicolon or spaces; a header line and blank lines are skipped. Errors
 * name the line.
 */
export function parseReadingsText(text: string): { readings: { volumeMl: number; pH: number }[]; errors: string[] } {
  const readings: { volumeMl: number; pH: number }[] = [];
  const errors: string[] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.trim();
    if (!line) return;
    // Tabs or semicolons separate cells when present (then a comma may be a decimal comma).
    const sep = /[\t;]/.test(line) ? /[\t;]+/ : /[,\s]+/;
    const cells = line.split(sep).map((c) => c.trim()).filter(Boolean);
    if (i === 0 && cells.some((c) => /[a-z]/i.test(c) && Number.isNaN(Number(c)))) return; // header
    const [v, p] = cells.map((c) => Number(c.replace(',', '.')));
    if (cells.length < 2 || !Number.isFinite(v) || !Number.isFinite(p)) {
      errors.push(`line ${i + 1}: expected a volume and a pH, got “${line.slice(0, 40)}”`);
      return;
    }
    readings.push({ volumeMl: v, pH: p });
  });
  return { readings, errors };
}
