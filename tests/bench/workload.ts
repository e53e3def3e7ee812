import { readFileSync } from 'node:fs'
import type { OutlookInput } from '../../shared/engine'

interface Workload {
  baselineYear: number
  years: number[]
  samples: number
  seed: number
  quantileLevels: number[]
  components: Array<{ key: string, scale: number, anchors: Record<string, number[]> }>
  correlation: number[][]
  landMotion: { rateMmPerYear: number, sigmaMmPerYear: number, epoch: number }
  heights: { from: number, to: number, step: number }
}

/** The W1 benchmark workload as an outlook request; its releases start from the workload's baseline year. */
export function loadWorkload(samples?: number): OutlookInput {
  const workload = JSON.parse(readFileSync(new URL('./workload-w1.json', import.meta.url), 'utf8')) as Workload
  return {
    baselineYear: workload.baselineYear,
    years: workload.years,
    samples: samples ?? workload.samples,
    seed: workload.seed,
    components: workload.components.map((component) => {
      const anchorYears = Object.keys(component.anchors).map(Number).sort((a, b) => a - b)
      return {
        key: component.key,
        scale: component.scale,
        release: {
          form: 'quantiles' as const,
          baselineYear: workload.baselineYear,
          anchorYears,
          levels: workload.quantileLevels,
          values: anchorYears.map(year => component.anchors[String(year)]!),
        },
      }
    }),
    correlation: workload.correlation,
    landMotion: {
      rateMmPerYear: workload.landMotion.rateMmPerYear,
      sigmaMmPerYear: workload.landMotion.sigmaMmPerYear,
      epoch: workload.landMotion.epoch,
    },
    heights: workload.heights,
    thresholds: [{ key: 'one-metre', height: 1.0 }],
  }
}
