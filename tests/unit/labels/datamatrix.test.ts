import bwipjs from "bwip-js/node";
import { describe, expect, it } from "vitest";

import { renderGs1DataMatrixPng, renderGs1DataMatrixSvg } from "@/lib/labels/datamatrix";
import { encodeElementString, GS, Gs1Error } from "@/lib/labels/gs1";

// PNG signature (PNG specification, section 5.2): 89 50 4E 47 0D 0A 1A 0A.
const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const pngSize = (png: Buffer) => ({ width: png.readUInt32BE(16), height: png.readUInt32BE(20) });

const setLabel = [{ ai: "8004", value: "9521234000017" }];

describe("renderGs1DataMatrixSvg", () => {
  it("draws an SVG document", () => {
    const svg = renderGs1DataMatrixSvg(setLabel);
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toContain("<path");
    expect(svg.trimEnd().endsWith("</svg>")).toBe(true);
  });

  it("encodes the same data, FNC1 for FNC1, as our element string", () => {
    // Independent check of the separators: bwip-js places FNC1 from the GS1 Barcode Syntax
    // Dictionary; drawing our transmitted string as a DataMatrix with FNC1 in first position and
    // FNC1 for each GS must give the identical symbol.
    const cases = [
      setLabel,
      [
        { ai: "01", value: "09521234543213" },
        { ai: "17", value: "250101" },
        { ai: "10", value: "ABC123" },
        { ai: "21", value: "SN42" },
      ],
      [
        { ai: "01", value: "09521234543213" },
        { ai: "10", value: "L(1)" },
        { ai: "7003", value: "2501011530" },
        { ai: "21", value: "S<GS>" },
      ],
    ];
    for (const elements of cases) {
      const raw = encodeElementString(elements);
      const plain = bwipjs.toSVG({ bcid: "datamatrix", text: "^FNC1" + raw.split(GS).join("^FNC1"), parsefnc: true, padding: 2 });
      expect(renderGs1DataMatrixSvg(elements)).toBe(plain);
    }
  });

  it("refuses invalid data with the GS1 module's error", () => {
    expect(() => renderGs1DataMatrixSvg([{ ai: "01", value: "09521234543214" }])).toThrow(Gs1Error);
    expect(() => renderGs1DataMatrixSvg([{ ai: "10", value: "L1" }])).toThrow(/must appear together/);
    expect(() => renderGs1DataMatrixSvg(setLabel, { quietZone: -1 })).toThrow(RangeError);
  });
});

describe("renderGs1DataMatrixPng", () => {
  it("draws a square PNG whose size follows scale and quiet zone", async () => {
    const png = await renderGs1DataMatrixPng(setLabel);
    expect(png.subarray(0, 8).equals(PNG_SIGNATURE)).toBe(true);
    const { width, height } = pngSize(png);
    expect(width).toBe(height);

    // Two more modules of quiet zone on each side: 2 × 2 modules × 2 units × scale pixels.
    const wider = pngSize(await renderGs1DataMatrixPng(setLabel, { scale: 3, quietZone: 3 }));
    const base = pngSize(await renderGs1DataMatrixPng(setLabel, { scale: 3, quietZone: 1 }));
    expect(wider.width - base.width).toBe(2 * 2 * 2 * 3);
    expect(base.width).toBe((width * 3) / 2);
  });

  it("rejects a scale that is not a whole number", async () => {
    await expect(renderGs1DataMatrixPng(setLabel, { scale: 1.5 })).rejects.toThrow(RangeError);
    await expect(renderGs1DataMatrixPng([{ ai: "8004", value: "95" }])).rejects.toThrow(Gs1Error);
  });
});
