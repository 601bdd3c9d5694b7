import { execFile } from 'node:child_process'
import { promisify } from 'node:util'

const run = promisify(execFile)

/** One word of a PDF page with its box in points (pdftotext -bbox: origin top left). */
export interface PdfWord {
  text: string
  xMin: number
  yMin: number
  xMax: number
  yMax: number
}
export interface PdfPage {
  width: number
  height: number
  /** The page's text in reading layout (pdftotext -layout): a table row stays on one line. */
  text: string
  words: PdfWord[]
}

const unescape = (s: string): string =>
  s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&apos;/g, "'")
    .replace(/&amp;/g, '&')

/**
 * Reads a PDF back with poppler-utils' pdftotext (Debian package poppler-utils): the layout text of
 * each page (pages end with a form feed) and every word's box from the -bbox XHTML output.
 */
export async function readPdf(file: string): Promise<PdfPage[]> {
  const layout = (await run('pdftotext', ['-layout', file, '-'], { maxBuffer: 64 << 20 })).stdout.split('\f')
  const xhtml = (await run('pdftotext', ['-bbox', file, '-'], { maxBuffer: 64 << 20 })).stdout
  return [...xhtml.matchAll(/<page width="([\d.]+)" height="([\d.]+)">([\s\S]*?)<\/page>/g)].map((m, i) => ({
    width: Number(m[1]),
    height: Number(m[2]),
    text: layout[i] ?? '',
    words: [
      ...m[3]!.matchAll(/<word xMin="([\d.-]+)" yMin="([\d.-]+)" xMax="([\d.-]+)" yMax="([\d.-]+)">([^<]*)<\/word>/g),
    ].map((w) => ({
      xMin: Number(w[1]),
      yMin: Number(w[2]),
      xMax: Number(w[3]),
      yMax: Number(w[4]),
      text: unescape(w[5]!),
    })),
  }))
}
