import { escapeHtml } from '@shared/html/escape-html';

/**
 * Building blocks of the report e-mail's HTML. Mail clients drop <style> blocks and scripts and
 * lay out CSS boxes unevenly, so everything here is tables with inline styles (common practice
 * for HTML e-mail, no single source).
 */

/** Deep teal, brass and warm greys. */
export const palette = {
  teal: '#0f5b5e',
  tealLight: '#d7e9e8',
  brass: '#b08a3e',
  ink: '#2b2825',
  muted: '#6f6862',
  rule: '#e4dfd9',
  paper: '#faf8f5',
};

const font = "'Public Sans', Arial, Helvetica, sans-serif";

/** A section heading. */
export function heading(text: string): string {
  return `<h2 style="margin:28px 0 8px;font-family:${font};font-size:17px;color:${palette.teal};font-weight:600">${escapeHtml(text)}</h2>`;
}

/** A short paragraph in the muted colour. */
export function note(text: string): string {
  return `<p style="margin:4px 0 12px;font-family:${font};font-size:13px;color:${palette.muted}">${escapeHtml(text)}</p>`;
}

const cell = `padding:6px 10px;border-bottom:1px solid ${palette.rule};font-family:${font};font-size:14px;color:${palette.ink}`;

/** A data table; numeric columns (by index) are right-aligned. */
export function dataTable(
  header: string[],
  rows: (string | number)[][],
  numeric: number[] = [],
): string {
  const align = (index: number) => (numeric.includes(index) ? 'right' : 'left');
  const head = header
    .map(
      (label, index) =>
        `<th align="${align(index)}" style="${cell};font-weight:600;color:${palette.muted};font-size:12px;text-transform:uppercase">${escapeHtml(label)}</th>`,
    )
    .join('');
  const body = rows
    .map(
      (row) =>
        `<tr>${row.map((value, index) => `<td align="${align(index)}" style="${cell}">${escapeHtml(value)}</td>`).join('')}</tr>`,
    )
    .join('');
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="border-collapse:collapse"><tr>${head}</tr>${body}</table>`;
}

/**
 * A bar chart drawn as a table: one row per bar, the bar a coloured cell whose width is its
 * share of the largest value. It shows in every mail client, images blocked or not.
 */
export function barTable(
  bars: { label: string; value: number; display?: string }[],
  maximum?: number,
): string {
  const largest = maximum ?? Math.max(1, ...bars.map((bar) => bar.value));
  const rows = bars
    .map((bar) => {
      const percent = Math.max(0, Math.min(100, Math.round((bar.value / largest) * 100)));
      const filled =
        percent > 0
          ? `<td width="${percent}%" bgcolor="${palette.teal}" style="background:${palette.teal};height:14px;font-size:1px;line-height:1px">&nbsp;</td>`
          : '';
      const rest =
        percent < 100
          ? `<td width="${100 - percent}%" style="height:14px;font-size:1px;line-height:1px">&nbsp;</td>`
          : '';
      return `<tr>
<td width="30%" style="padding:3px 10px 3px 0;font-family:${font};font-size:13px;color:${palette.ink}">${escapeHtml(bar.label)}</td>
<td width="55%" style="padding:3px 0"><table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="border-collapse:collapse;background:${palette.tealLight}"><tr>${filled}${rest}</tr></table></td>
<td width="15%" align="right" style="padding:3px 0 3px 10px;font-family:${font};font-size:13px;color:${palette.ink}">${escapeHtml(bar.display ?? String(bar.value))}</td>
</tr>`;
    })
    .join('');
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="border-collapse:collapse">${rows}</table>`;
}

/** Headline figures in a row of boxes. */
export function figureBoxes(figures: { label: string; value: string }[]): string {
  const boxes = figures
    .map(
      (figure) =>
        `<td style="padding:10px 12px;border-top:3px solid ${palette.brass};background:#ffffff;font-family:${font}"><div style="font-size:22px;font-weight:600;color:${palette.ink}">${escapeHtml(figure.value)}</div><div style="font-size:12px;color:${palette.muted}">${escapeHtml(figure.label)}</div></td>`,
    )
    .join('<td width="8" style="font-size:1px">&nbsp;</td>');
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="border-collapse:collapse"><tr>${boxes}</tr></table>`;
}

/** The whole message: a centred 640-pixel column on a warm paper background. */
export function mailDocument(title: string, subtitle: string, body: string, district = ''): string {
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;padding:0;background:${palette.paper}">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${palette.paper}"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="640" cellpadding="0" cellspacing="0" style="max-width:640px;width:100%">
<tr><td style="background:${palette.teal};padding:18px 20px;font-family:${font};color:#ffffff">${district ? `<div style="font-size:12px;letter-spacing:.04em;text-transform:uppercase;opacity:0.85">${escapeHtml(district)}</div>` : ''}<div style="font-size:20px;font-weight:600">${escapeHtml(title)}</div><div style="font-size:13px;opacity:0.85">${escapeHtml(subtitle)}</div></td></tr>
<tr><td style="padding:8px 20px 24px;background:#ffffff">${body}</td></tr>
<tr><td style="padding:12px 20px;font-family:${font};font-size:12px;color:${palette.muted}">Sent by Tuttiboard. Student details in this message are for the school's music staff only.</td></tr>
</table></td></tr></table></body></html>`;
}
