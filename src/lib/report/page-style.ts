/**
 * The print page box of the report: margins, and in the margins on every page the room, source and
 * date (top), the caution and the page number (bottom). @page margin boxes take only static CSS
 * strings, so the text is written into a style sheet.
 */

/** A CSS string literal: quotes and backslashes escaped, line breaks as \A, controls dropped. */
export function cssString(text: string): string {
  // eslint-disable-next-line no-control-regex
  const clean = text.replace(/[\u0000-\u0009\u000b-\u001f\u007f]/g, '')
  return `"${clean.replace(/\\/g, '\\\\').replace(/"/g, '\\"').replace(/\n/g, '\\A ')}"`
}

/** Page margins in millimetres (top, right, bottom, left): room for the header and the caution. */
export const PAGE_MARGINS_MM = [18, 14, 24, 14] as const

/** The style sheet for @page: works for A4 and US Letter alike (the paper size comes from the print dialog). */
export function pageStyle(o: { header: string; date: string; caution: string }): string {
  const [top, right, bottom, left] = PAGE_MARGINS_MM
  const small = 'font-family: sans-serif; font-size: 7.5pt; color: #444;'
  return `@page {
  margin: ${top}mm ${right}mm ${bottom}mm ${left}mm;
  @top-left { content: ${cssString(o.header)}; ${small} vertical-align: bottom; padding-bottom: 3mm; }
  @top-right { content: ${cssString(o.date)}; ${small} vertical-align: bottom; padding-bottom: 3mm; white-space: nowrap; }
  @bottom-left { content: ${cssString(o.caution)}; ${small} font-size: 6.5pt; vertical-align: top; padding-top: 3mm; }
  @bottom-right { content: "Page " counter(page) " of " counter(pages); ${small} vertical-align: top; padding-top: 3mm; white-space: nowrap; width: 24mm; text-align: right; }
}`
}
