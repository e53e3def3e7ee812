import { toCsv } from '#shared/releases/csv'

/**
 * Saves a table as a CSV file built in the browser. Cells go through the same formula guard as
 * release exports, so a label such as "=HYPERLINK(…)" cannot run when the file is opened.
 */
export function useCsvDownload() {
  return (filename: string, rows: (string | number)[][]) => {
    const blob = new Blob(['\uFEFF', toCsv(rows)], { type: 'text/csv;charset=utf-8' })
    const url = URL.createObjectURL(blob)
    const link = document.createElement('a')
    link.href = url
    link.download = filename
    document.body.append(link)
    link.click()
    link.remove()
    URL.revokeObjectURL(url)
  }
}
