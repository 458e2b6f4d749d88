// Building blocks for e-mail bodies: escaping and one shared HTML frame.

export function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;")
    .replaceAll('"', "&quot;")
    .replaceAll("'", "&#39;");
}

/** Wraps already-escaped body HTML in the Steamlane mail frame. */
export function mailFrame(titleText: string, bodyHtml: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(titleText)}</title></head>
<body style="margin:0;background:#f4f2ec;font-family:Helvetica,Arial,sans-serif;color:#1d2a2f">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border-radius:12px;border:1px solid #ddd8cc">
<tr><td style="padding:20px 28px;border-bottom:4px solid #0f5e63;font-size:18px;font-weight:bold;color:#0f5e63">Steamlane</td></tr>
<tr><td style="padding:24px 28px;font-size:15px;line-height:1.5">${bodyHtml}</td></tr>
<tr><td style="padding:16px 28px;font-size:12px;color:#6b6f68">Sent by Steamlane for Larkmoor Sterile Services. Please do not reply to this message.</td></tr>
</table></td></tr></table></body></html>`;
}

/** A button-like link, for the one action an e-mail asks for. */
export function mailButton(href: string, label: string): string {
  return `<p style="margin:24px 0"><a href="${escapeHtml(href)}" style="background:#0f5e63;color:#ffffff;padding:12px 20px;border-radius:8px;text-decoration:none;font-weight:bold">${escapeHtml(label)}</a></p>`;
}
