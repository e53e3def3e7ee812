import { maxOf, minOf } from '#shared/engine/arrays'
import { niceAxis, niceYearAxis, yearAxisLabel } from '#shared/charts/nice-axis'

// Shared look of the outlook charts, in the app's palette (tailwind.config.ts). Text colours are the
// dark dune and abyss shades, which keep AA contrast on the white cards.

export const CHART_COLOURS = {
  ink: '#0b1a23',
  text: '#29241a',
  grid: '#e4dcc7',
  axis: '#7b6a45',
  bands: { outer: '#d5eef3', wide: '#addde7', likely: '#46a6bd' },
  /** Distinct series: years, thresholds, scenarios, in order. */
  series: ['#1f6f86', '#b93d2a', '#3f7d4a', '#7b6a45', '#0b1a23', '#46a6bd', '#9a3222'],
  /** One colour per part of the rise, stable across pages. */
  parts: {
    'ocean-expansion': '#1f6f86',
    'glaciers': '#7cc5d6',
    'greenland': '#3f7d4a',
    'antarctica': '#1a3e4c',
    'land-water': '#b9a679',
    'regional-ocean': '#46a6bd',
    'other': '#d1c3a0',
    'land-motion': '#b93d2a',
  } as Record<string, string>,
}

export const CHART_FONT = '"Atkinson Hyperlegible", system-ui, sans-serif'

export function chartAxis(extra: Record<string, unknown> = {}) {
  const { axisLabel, ...rest } = extra as { axisLabel?: Record<string, unknown> }
  return {
    // Labels that would touch on a narrow screen are dropped rather than drawn over each other.
    axisLabel: { color: CHART_COLOURS.text, fontSize: 12, hideOverlap: true, ...axisLabel },
    nameTextStyle: { color: CHART_COLOURS.text, fontSize: 12 },
    axisLine: { lineStyle: { color: CHART_COLOURS.axis } },
    splitLine: { lineStyle: { color: CHART_COLOURS.grid } },
    ...rest,
  }
}

/**
 * Axis numbers as the reader writes them ("0,5" beside Spanish text, "0.5" beside English), with the
 * same grouping as the tables; ECharts would otherwise write every axis the English way.
 */
export function axisNumberFormat(locale: string) {
  const format = new Intl.NumberFormat(locale, { maximumFractionDigits: 3 })
  return (value: number) => format.format(value)
}

/** The frame every outlook chart shares: no animation, the app's font, the description for screen readers. */
export function chartFrame(description: string, extra: Record<string, unknown>) {
  return {
    aria: { enabled: true, label: { description } },
    animation: false,
    textStyle: { fontFamily: CHART_FONT },
    grid: { left: 64, right: 32, top: 56, bottom: 48 },
    ...extra,
  }
}

/**
 * A time axis from the decade of the first year to that of the last (2020 … 2150 for an outlook from
 * 2020), labelled on round steps (2050, 2100, 2150) so four digits never touch on a phone.
 */
export function yearAxis(years: number[]) {
  // The first year starts at the corner rather than centred on it, clear of the value axis's 0.
  const axis = niceYearAxis(minOf(years), maxOf(years))
  return chartAxis({
    type: 'value',
    min: axis.min,
    max: axis.max,
    interval: axis.interval,
    axisLabel: {
      color: CHART_COLOURS.text,
      formatter: yearAxisLabel(axis),
      alignMinLabel: 'left',
      alignMaxLabel: 'right',
    },
  })
}

/** A value axis whose ends and step are round numbers covering `values` (heights, in the page's unit). */
export function roundAxis(values: number[], extra: Record<string, unknown> = {}) {
  return chartAxis({ type: 'value', ...niceAxis(minOf(values), maxOf(values)), ...extra })
}

export function chartLegend(names: string[]) {
  return { top: 0, type: 'scroll', data: names, textStyle: { color: CHART_COLOURS.ink, fontSize: 13 } }
}
