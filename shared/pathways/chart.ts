import type { StepDecision } from './decisions'

// The pathways chart, our own design: time across, one row per measure in the pathway's order, and
// in each row one lane per scenario showing the years the measure serves (from the tipping of the one
// before to its own tipping). A diamond marks the decision year on the next measure's lane; a late
// decision is a filled square. Lanes differ by fill and are labelled with their scenario, so the chart
// reads in greyscale. The page (components/pathway/PathwayChart.vue) draws the same layout
// interactively; `pathwayChartSvg` draws it as a string for the PDF.

export interface ChartMeasure { id: string, name: string }

export interface PathwayChartInput {
  measures: ChartMeasure[]
  scenarios: string[]
  /** Decisions of one tolerance. */
  decisions: StepDecision[]
  startYear: number
  endYear: number
  currentYear: number
}

export const LANE_FILLS = ['#1b4a5a', '#7b7b7b', '#ffffff', '#c8c8c8', '#3f3726'] as const
export const LANE_HEIGHT = 14
const LANE_GAP = 4
const ROW_GAP = 18
const LEFT = 78
/** Each row's measure name sits on a line of its own above its lanes. */
const NAME_LINE = 16
const RIGHT = 24
const TOP = 28
const AXIS = 46

export interface ChartLane {
  scenario: string
  index: number
  y: number
  x0: number
  x1: number
  from: number
  to: number | null
  openEnd: boolean
}
export interface ChartMarker { scenario: string, x: number, y: number, year: number, late: boolean, measure: string }
export interface ChartRow { measureId: string, name: string, y: number, height: number, lanes: ChartLane[] }
export interface PathwayChartLayout {
  width: number
  height: number
  left: number
  plotRight: number
  top: number
  axisY: number
  rows: ChartRow[]
  markers: ChartMarker[]
  ticks: Array<{ year: number, x: number }>
  today: { x: number, year: number } | null
}

export function pathwayChartLayout(input: PathwayChartInput, width = 760): PathwayChartLayout {
  const plotRight = width - RIGHT
  const span = Math.max(1, input.endYear - input.startYear)
  const x = (year: number) =>
    LEFT + ((Math.min(Math.max(year, input.startYear), input.endYear) - input.startYear) / span) * (plotRight - LEFT)
  const rowHeight = NAME_LINE + input.scenarios.length * (LANE_HEIGHT + LANE_GAP) - LANE_GAP
  const tipping = (measureId: string, scenario: string) =>
    input.decisions.find(d => d.fromMeasureId === measureId && d.scenario === scenario)
  const rows: ChartRow[] = []
  const markers: ChartMarker[] = []
  input.measures.forEach((measure, i) => {
    const y = TOP + i * (rowHeight + ROW_GAP)
    const lanes: ChartLane[] = []
    input.scenarios.forEach((scenario, s) => {
      const laneY = y + NAME_LINE + s * (LANE_HEIGHT + LANE_GAP)
      const before = i === 0 ? null : tipping(input.measures[i - 1]!.id, scenario)
      // A measure after one that does not tip by the horizon is never needed within it: no lane.
      if (i > 0 && (!before || before.tippingYear === null)) return
      const from = i === 0 ? input.startYear : before!.tippingYear!
      const own = i === input.measures.length - 1 ? null : tipping(measure.id, scenario)
      const to = own?.tippingYear ?? null
      lanes.push({
        scenario,
        index: s,
        y: laneY,
        x0: x(from),
        x1: x(to ?? input.endYear),
        from,
        to,
        openEnd: to === null,
      })
      if (before && before.decisionYear !== null) {
        markers.push({
          scenario,
          x: x(before.decisionYear),
          y: laneY + LANE_HEIGHT / 2,
          year: before.decisionYear,
          late: before.alreadyLate,
          measure: measure.name,
        })
      }
    })
    rows.push({ measureId: measure.id, name: measure.name, y, height: rowHeight, lanes })
  })
  const axisY = TOP + input.measures.length * (rowHeight + ROW_GAP) - ROW_GAP + 10
  const step = span > 100 ? 20 : span > 40 ? 10 : 5
  const ticks: Array<{ year: number, x: number }> = []
  for (let year = Math.ceil(input.startYear / step) * step; year <= input.endYear; year += step)
    ticks.push({ year, x: x(year) })
  const today
    = input.currentYear >= input.startYear && input.currentYear <= input.endYear
      ? { x: x(input.currentYear), year: input.currentYear }
      : null
  return { width, height: axisY + AXIS, left: LEFT, plotRight, top: TOP, axisY, rows, markers, ticks, today }
}

function escape(value: string) {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;')
}

/** Words the chart draws, in the reader's language. */
export interface PathwayChartWords {
  title: string
  today: string
  late: string
  decision: string
  beyond: string
  font: string
}

/** A diamond of half-width r, or for a late decision a square (shape as well as fill says it). */
export function markerPath(marker: ChartMarker, r = 6) {
  return marker.late
    ? `M${marker.x - r},${marker.y - r}h${2 * r}v${2 * r}h${-2 * r}z`
    : `M${marker.x},${marker.y - r}l${r},${r}l${-r},${r}l${-r},${-r}z`
}

export function pathwayChartSvg(layout: PathwayChartLayout, words: PathwayChartWords): string {
  const font = `font-family="${escape(words.font)}"`
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${layout.width}" height="${layout.height}" viewBox="0 0 ${layout.width} ${layout.height}" role="img" aria-label="${escape(words.title)}">`,
    `<rect x="0" y="0" width="${layout.width}" height="${layout.height}" fill="#ffffff"/>`,
  ]
  for (const tick of layout.ticks) {
    parts.push(
      `<line x1="${tick.x}" y1="${layout.top - 6}" x2="${tick.x}" y2="${layout.axisY}" stroke="#e0e0e0" stroke-width="1"/>`,
    )
    parts.push(
      `<text x="${tick.x}" y="${layout.axisY + 16}" font-size="11" text-anchor="middle" fill="#222222" ${font}>${tick.year}</text>`,
    )
  }
  parts.push(
    `<line x1="${layout.left}" y1="${layout.axisY}" x2="${layout.plotRight}" y2="${layout.axisY}" stroke="#222222" stroke-width="1"/>`,
  )
  for (const row of layout.rows) {
    parts.push(
      `<text x="8" y="${row.y + 11}" font-size="12" font-weight="bold" fill="#111111" ${font}>${escape(truncate(row.name, 90))}</text>`,
    )
    for (const lane of row.lanes) {
      const fill = LANE_FILLS[lane.index % LANE_FILLS.length]!
      parts.push(
        `<text x="${layout.left - 6}" y="${lane.y + LANE_HEIGHT - 3}" font-size="10" text-anchor="end" fill="#333333" ${font}>${escape(lane.scenario)}</text>`,
      )
      parts.push(
        `<rect x="${lane.x0}" y="${lane.y}" width="${Math.max(1, lane.x1 - lane.x0)}" height="${LANE_HEIGHT}" fill="${fill}" stroke="#111111" stroke-width="1"/>`,
      )
      if (lane.openEnd)
        parts.push(
          `<text x="${Math.min(lane.x1 + 2, layout.width - 2)}" y="${lane.y + LANE_HEIGHT - 3}" font-size="10" text-anchor="${lane.x1 + 30 > layout.width ? 'end' : 'start'}" fill="#111111" ${font}>${escape(words.beyond)}</text>`,
        )
      else
        parts.push(
          `<text x="${lane.x1 + 3}" y="${lane.y + LANE_HEIGHT - 3}" font-size="10" fill="#111111" ${font}>${lane.to}</text>`,
        )
    }
  }
  for (const marker of layout.markers) {
    parts.push(
      `<path d="${markerPath(marker)}" fill="${marker.late ? '#000000' : '#ffffff'}" stroke="#000000" stroke-width="1.5"/>`,
    )
  }
  if (layout.today) {
    parts.push(
      `<line x1="${layout.today.x}" y1="${layout.top - 10}" x2="${layout.today.x}" y2="${layout.axisY}" stroke="#000000" stroke-width="1.5" stroke-dasharray="4 3"/>`,
    )
    parts.push(
      `<text x="${layout.today.x}" y="${layout.top - 14}" font-size="11" text-anchor="middle" fill="#000000" ${font}>${escape(words.today)} ${layout.today.year}</text>`,
    )
  }
  // Key: the two marker shapes.
  const keyY = layout.height - 6
  parts.push(
    `<path d="${markerPath({ x: layout.left + 6, y: keyY - 4, late: false } as ChartMarker, 5)}" fill="#ffffff" stroke="#000000"/>`,
  )
  parts.push(
    `<text x="${layout.left + 16}" y="${keyY}" font-size="10" fill="#111111" ${font}>${escape(words.decision)}</text>`,
  )
  parts.push(
    `<path d="${markerPath({ x: layout.left + 186, y: keyY - 4, late: true } as ChartMarker, 5)}" fill="#000000" stroke="#000000"/>`,
  )
  parts.push(
    `<text x="${layout.left + 196}" y="${keyY}" font-size="10" fill="#111111" ${font}>${escape(words.late)}</text>`,
  )
  parts.push('</svg>')
  return parts.join('')
}

function truncate(value: string, length: number) {
  return value.length > length ? `${value.slice(0, length - 1)}…` : value
}
