import { readFileSync } from 'node:fs'
import { launchBrowser } from './support/browser'
const [input, output, y, h, w] = process.argv.slice(2)
const browser = await launchBrowser()
const page = await browser.newPage({ viewport: { width: Number(w), height: 800 } })
await page.setContent(`<body style="margin:0"><img src="data:image/png;base64,${readFileSync(input!).toString('base64')}"></body>`)
await page.waitForLoadState('load')
await page.screenshot({ path: output, clip: { x: 0, y: Number(y), width: Number(w), height: Number(h) }, fullPage: true })
await browser.close()
