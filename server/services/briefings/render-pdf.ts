// The only pdfmake import: fonts, access policies and rendering a definition to bytes.
// Fonts are pdfmake's bundled Roboto TTFs (full Latin-Extended, Greek, Cyrillic), so names
// like "Čapek" or "Zoë" print; the web-font subsets drop such letters and WOFF2 can crash the
// subsetter (STACK.md, PDF fonts). No URL is ever fetched and only the font folder is readable.
import { createRequire } from 'node:module';
import path from 'node:path';
import pdfmake from 'pdfmake';
import type { TDocumentDefinitions } from 'pdfmake/interfaces';

const fontDir = path.join(path.dirname(createRequire(import.meta.url).resolve('pdfmake/package.json')), 'fonts', 'Roboto');

let configured = false;

function configure(): void {
  if (configured) return;
  pdfmake.setFonts({
    Roboto: {
      normal: path.join(fontDir, 'Roboto-Regular.ttf'),
      // pdfmake's own mapping: Medium stands in for bold.
      bold: path.join(fontDir, 'Roboto-Medium.ttf'),
      italics: path.join(fontDir, 'Roboto-Italic.ttf'),
      bolditalics: path.join(fontDir, 'Roboto-MediumItalic.ttf'),
    },
  });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy((p) => path.resolve(p).startsWith(fontDir + path.sep));
  configured = true;
}

export async function renderPdf(definition: TDocumentDefinitions): Promise<Buffer> {
  configure();
  return pdfmake.createPdf(definition).getBuffer();
}
