import { join } from 'node:path'
import * as echarts from 'echarts'
import pdfmakeModule from 'pdfmake'
import type { TDocumentDefinitions } from 'pdfmake/interfaces'

// pdfmake on the server with the app's own font. PDFKit reads fonts from disk (SVG text too), so
// the shipped .woff files are written out once and only that folder may be read.

export const PDF_FONT = 'Atkinson Hyperlegible'

interface PdfMake {
  setFonts: (fonts: Record<string, Record<string, string>>) => void
  setLocalAccessPolicy: (allow: (path: string) => boolean) => void
  setUrlAccessPolicy: (allow: (url: string) => boolean) => void
  createPdf: (doc: TDocumentDefinitions) => { getBuffer: () => Promise<Buffer> }
}

let ready: Promise<PdfMake> | undefined

async function setup(): Promise<PdfMake> {
  const pdfmake = pdfmakeModule as unknown as PdfMake
  const folder = await materialiseAssets('fonts')
  const file = (style: string) => join(folder, `atkinson-hyperlegible-latin-${style}.woff`)
  pdfmake.setLocalAccessPolicy(path => path.startsWith(folder))
  pdfmake.setUrlAccessPolicy(() => false)
  pdfmake.setFonts({
    [PDF_FONT]: {
      normal: file('400-normal'),
      bold: file('700-normal'),
      italics: file('400-italic'),
      bolditalics: file('700-italic'),
    },
  })
  return pdfmake
}

export async function renderPdf(doc: TDocumentDefinitions): Promise<Buffer> {
  ready ??= setup()
  const pdfmake = await ready
  return pdfmake.createPdf(doc).getBuffer()
}

/** An ECharts option drawn as an SVG string on the server, for embedding in a PDF. */
export function chartSvg(option: Record<string, unknown>, width: number, height: number): string {
  // Server-side rendering: no DOM element, ECharts draws into an SVG string.
  const chart = echarts.init(null as unknown as HTMLElement, undefined, { renderer: 'svg', ssr: true, width, height })
  chart.setOption(option)
  const svg = chart.renderToSVGString()
  chart.dispose()
  return svg
}
