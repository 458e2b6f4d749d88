// GS1 DataMatrix symbols for labels, drawn by bwip-js. Server side: the PNG encoder uses Node's
// zlib. Elements are validated by the GS1 module first, so a bad value fails with the same
// Gs1Error a scan would, before bwip-js sees it.
import bwipjs from "bwip-js/node";

import { encodeElementString, Gs1Error, type Gs1ElementInput } from "@/lib/labels/gs1";

export interface DataMatrixOptions {
  /** Light margin around the symbol, in modules (default 1, the DataMatrix minimum in ISO/IEC 16022, from memory). */
  quietZone?: number;
}

export interface DataMatrixPngOptions extends DataMatrixOptions {
  /** Pixels per module are 2 × scale (bwip-js draws a module as 2 units); whole number, default 2. */
  scale?: number;
}

// bwip-js reads the bracketed form and splits it at "(", so parentheses inside data (allowed in
// character set 82) go in as its ^NNN escapes; "^" itself is outside character set 82.
function bwipText(elements: readonly Gs1ElementInput[]): string {
  return elements
    .map((element) => `(${element.ai})${element.value.replace(/\(/g, "^040").replace(/\)/g, "^041")}`)
    .join("");
}

function symbolOptions(elements: readonly Gs1ElementInput[], options: DataMatrixOptions) {
  // Same checks as any encoded element string: lengths, characters, check digits, dates, pairs.
  encodeElementString(elements);
  const quietZone = options.quietZone ?? 1;
  if (!Number.isInteger(quietZone) || quietZone < 0 || quietZone > 20) {
    throw new RangeError(`quietZone must be a whole number of modules from 0 to 20, got ${quietZone}`);
  }
  return { bcid: "gs1datamatrix", text: bwipText(elements), parse: true, padding: quietZone * 2 };
}

function renderError(error: unknown): Gs1Error {
  const reason = error instanceof Error ? error.message : String(error);
  return new Gs1Error("render", `The DataMatrix could not be drawn: ${reason}`);
}

// An SVG document (viewBox only; the label layout sets its printed size).
export function renderGs1DataMatrixSvg(elements: readonly Gs1ElementInput[], options: DataMatrixOptions = {}): string {
  const symbol = symbolOptions(elements, options);
  try {
    return bwipjs.toSVG(symbol);
  } catch (error) {
    throw renderError(error);
  }
}

// A black-on-white PNG image.
export async function renderGs1DataMatrixPng(
  elements: readonly Gs1ElementInput[],
  options: DataMatrixPngOptions = {},
): Promise<Buffer> {
  const scale = options.scale ?? 2;
  if (!Number.isInteger(scale) || scale < 1 || scale > 50) {
    throw new RangeError(`scale must be a whole number from 1 to 50, got ${scale}`);
  }
  const symbol = symbolOptions(elements, options);
  try {
    return await bwipjs.toBuffer({ ...symbol, scale });
  } catch (error) {
    throw renderError(error);
  }
}
