import { createRequire } from 'node:module';
import path from 'node:path';
import pdfmake from 'pdfmake';

/**
 * The one pdfmake set-up of the server (its Node entry is a process-wide singleton, so fonts
 * and access rules must be set in one place): Work Sans, the typeface of the app, from the
 * full TTFs (the browser package's woff subsets crash pdfkit's subsetter); no URLs, and no
 * file but these fonts, since documents are built from our own data only.
 */
const require = createRequire(import.meta.url);
const font = (weight: string) => require.resolve(`@expo-google-fonts/work-sans/${weight}/WorkSans_${weight}.ttf`);
const FONTS = {
  WorkSans: { normal: font('400Regular'), bold: font('600SemiBold'), italics: font('400Regular_Italic'), bolditalics: font('600SemiBold_Italic') },
};
const allowed = new Set(Object.values(FONTS.WorkSans));
pdfmake.setFonts(FONTS);
pdfmake.setUrlAccessPolicy(() => false);
pdfmake.setLocalAccessPolicy((p) => allowed.has(path.resolve(p)));

/** The brand colour of headings in every PDF. */
export const PDF_TEAL = '#12606B';

/** Renders a document definition (font `WorkSans`) to a PDF buffer. */
export async function renderPdf(doc: object): Promise<Buffer> {
  return Buffer.from(await pdfmake.createPdf(doc as Parameters<typeof pdfmake.createPdf>[0]).getBuffer());
}
