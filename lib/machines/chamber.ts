// A machine's inner chamber and how many sterilisation units fit in it. One StU is a module of
// 300 × 300 × 600 mm (EN 285); a chamber holds as many whole modules as fit, which is not its
// volume divided by 54 l. The 600 mm side may lie along the depth or across the width, whichever
// fits more; modules stack in height. Pure.

export const STU_MM = { width: 300, height: 300, depth: 600 } as const;

export interface Chamber {
  widthMm: number;
  heightMm: number;
  depthMm: number;
}

/** Whole StU modules that fit in the chamber. */
export function stuThatFit(c: Chamber): number {
  const layers = Math.floor(c.heightMm / STU_MM.height);
  const lengthwise = Math.floor(c.widthMm / STU_MM.width) * Math.floor(c.depthMm / STU_MM.depth);
  const crosswise = Math.floor(c.widthMm / STU_MM.depth) * Math.floor(c.depthMm / STU_MM.width);
  return layers * Math.max(lengthwise, crosswise);
}

/** "680 × 1000 × 700 mm (width × height × depth)". */
export function describeChamber(c: Chamber): string {
  return `${c.widthMm} × ${c.heightMm} × ${c.depthMm} mm (width × height × depth)`;
}
