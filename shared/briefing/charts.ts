import { fromMetres, type HeightUnit } from '../units'
import type { BriefingDocument } from './document'
import { BRIEFING_TEXT } from './text'
import { niceAxis, niceYearAxis, yearAxisLabel } from '../charts/nice-axis'

// ECharts options for a briefing's two charts, shared by the page (vue-echarts) and the PDF
// (server-side SVG), so both draw the same thing. Plain objects: no ECharts import here.

const INK = '#0b1a23'
const GRID = '#e4dcc7'
const YEAR_COLOURS = ['#1f6f86', '#d9513b', '#3f7d4a', '#7b6a45']
const BANDS = { extreme: '#d5eef3', veryLikely: '#addde7', likely: '#46a6bd', median: '#0c2630' }

// Labels that would touch on a narrow screen are dropped rather than drawn over each other.
const axisText = { color: INK, fontSize: 11 }
const axisLabel = { ...axisText, hideOverlap: true }

export function exceedanceChartOption(doc: BriefingDocument, fontFamily = 'Atkinson Hyperlegible') {
  const text = BRIEFING_TEXT[doc.meta.language]
  const unit: HeightUnit = doc.meta.units
  return {
    animation: false,
    textStyle: { fontFamily },
    color: YEAR_COLOURS,
    // Room under the legend for the axis name, so they never meet on a phone.
    grid: { left: 56, right: 24, top: 60, bottom: 48 },
    legend: { top: 0, textStyle: axisText },
    xAxis: {
      // The unit goes in the axis name, so the numbers stay short enough not to collide on a phone.
      type: 'value',
      name: `${text.chartExceedanceAxis.x} (${unit})`,
      nameLocation: 'middle',
      nameGap: 30,
      nameTextStyle: axisText,
      axisLabel: { ...axisLabel, formatter: (v: number) => v.toLocaleString(doc.meta.language) },
      // Round ends and a round step, so the axis reads 0.2 … 1.4 rather than 0.1 … 1.3.
      ...niceAxis(fromMetres(doc.charts.heights[0]!, unit), fromMetres(doc.charts.heights.at(-1)!, unit)),
      splitLine: { lineStyle: { color: GRID } },
    },
    yAxis: {
      type: 'value',
      min: 0,
      max: 1,
      name: text.chartExceedanceAxis.y,
      nameTextStyle: axisText,
      axisLabel: { ...axisText, formatter: (v: number) => `${Math.round(v * 100)} %` },
      splitLine: { lineStyle: { color: GRID } },
    },
    series: doc.charts.exceedance.map(curve => ({
      type: 'line',
      name: String(curve.year),
      showSymbol: false,
      lineStyle: { width: 2.5 },
      data: curve.values.map((p, i) => [fromMetres(doc.charts.heights[i]!, unit), p]),
    })),
  }
}

/** A fan of stacked bands: each band series carries the gap above the one below it. */
export function fanChartOption(doc: BriefingDocument, fontFamily = 'Atkinson Hyperlegible') {
  const text = BRIEFING_TEXT[doc.meta.language]
  const unit: HeightUnit = doc.meta.units
  const fan = doc.charts.fan
  const years = niceYearAxis(fan.years[0]!, fan.years.at(-1)!)
  const u = (values: number[]) => values.map(v => fromMetres(v, unit))
  // Pairs of [year, value] on a value axis of years, so its ends can be round decades.
  const at = (values: number[]) => values.map((v, i) => [fan.years[i]!, v])
  const gap = (upper: number[], lower: number[]) => at(u(upper).map((v, i) => v - u(lower)[i]!))
  const band = (name: string, data: number[][], color: string) => ({
    type: 'line',
    name,
    stack: 'fan',
    data,
    symbol: 'none',
    lineStyle: { width: 0 },
    itemStyle: { color },
    areaStyle: { color, opacity: 1 },
  })
  return {
    animation: false,
    textStyle: { fontFamily },
    grid: { left: 56, right: 24, top: 56, bottom: 32 },
    legend: {
      top: 0,
      textStyle: axisText,
      icon: 'rect',
      data: [
        text.chartFanLegend.median,
        text.chartFanLegend.likely,
        text.chartFanLegend.veryLikely,
        text.chartFanLegend.extreme,
      ],
    },
    xAxis: {
      type: 'value',
      min: years.min,
      max: years.max,
      interval: years.interval,
      axisLabel: {
        ...axisLabel,
        formatter: yearAxisLabel(years),
        alignMinLabel: 'left',
        alignMaxLabel: 'right',
      },
      splitLine: { show: false },
    },
    yAxis: {
      type: 'value',
      axisLabel: { ...axisLabel, formatter: (v: number) => `${v.toLocaleString(doc.meta.language)} ${unit}` },
      splitLine: { lineStyle: { color: GRID } },
    },
    series: [
      {
        type: 'line',
        name: 'base',
        stack: 'fan',
        data: at(u(fan.p1)),
        symbol: 'none',
        lineStyle: { width: 0 },
        silent: true,
      },
      band(text.chartFanLegend.extreme, gap(fan.p5, fan.p1), BANDS.extreme),
      band(text.chartFanLegend.veryLikely, gap(fan.p17, fan.p5), BANDS.veryLikely),
      band(text.chartFanLegend.likely, gap(fan.p83, fan.p17), BANDS.likely),
      band(`${text.chartFanLegend.veryLikely} `, gap(fan.p95, fan.p83), BANDS.veryLikely),
      band(`${text.chartFanLegend.extreme} `, gap(fan.p99, fan.p95), BANDS.extreme),
      {
        type: 'line',
        name: text.chartFanLegend.median,
        data: at(u(fan.p50)),
        symbol: 'none',
        lineStyle: { width: 2.5, color: BANDS.median },
        itemStyle: { color: BANDS.median },
      },
    ],
  }
}
