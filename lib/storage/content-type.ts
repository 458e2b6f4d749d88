// What a file really is, read from its first bytes rather than from its name or the browser's word.

export const FILE_KINDS = ["pdf", "png", "jpeg", "csv"] as const;
export type FileKind = (typeof FILE_KINDS)[number];

export const CONTENT_TYPES: Record<FileKind, string> = {
  pdf: "application/pdf",
  png: "image/png",
  jpeg: "image/jpeg",
  csv: "text/csv",
};

const KIND_LABELS: Record<FileKind, string> = { pdf: "PDF", png: "PNG image", jpeg: "JPEG image", csv: "CSV file" };

export function describeKinds(kinds: readonly FileKind[]): string {
  return kinds.map((k) => KIND_LABELS[k]).join(", ");
}

function startsWith(bytes: Uint8Array, signature: number[]): boolean {
  return signature.every((b, i) => bytes[i] === b);
}

/** The kind of file the bytes are, or null when they are none of the kinds we accept. */
export function sniffFileKind(bytes: Uint8Array): FileKind | null {
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return "pdf"; // "%PDF-"
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "png";
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return "jpeg";
  if (looksLikeCsvText(bytes)) return "csv";
  return null;
}

/** UTF-8 text (an optional byte-order mark), no NUL or other binary control bytes. */
function looksLikeCsvText(bytes: Uint8Array): boolean {
  if (bytes.length === 0) return false;
  for (const b of bytes.subarray(0, 8192)) {
    if (b === 0 || (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d)) return false;
  }
  try {
    new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    return true;
  } catch {
    return false;
  }
}
