import { createRequire } from "node:module";
import path from "node:path";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

// Reads the text a PDF draws, page by page, with Mozilla's PDF.js: what a reader would see,
// so a test can check that the words a user typed came out as text.

const fontsDir = path.join(path.dirname(createRequire(import.meta.url).resolve("pdfjs-dist/package.json")), "standard_fonts") + path.sep;

/** The text of every page, joined by spaces and with runs of white space collapsed. */
export async function pdfPagesText(bytes: Uint8Array): Promise<string[]> {
  const document = await getDocument({ data: new Uint8Array(bytes), standardFontDataUrl: fontsDir, isEvalSupported: false }).promise;
  try {
    const pages: string[] = [];
    for (let n = 1; n <= document.numPages; n++) {
      const content = await (await document.getPage(n)).getTextContent();
      pages.push(
        content.items
          .map((item) => ("str" in item ? item.str : ""))
          .join(" ")
          .replace(/\s+/g, " ")
          .trim(),
      );
    }
    return pages;
  } finally {
    await document.destroy();
  }
}

/** All the text a PDF draws, its pages joined by spaces. */
export async function pdfText(bytes: Uint8Array): Promise<string> {
  return (await pdfPagesText(bytes)).join(" ");
}
