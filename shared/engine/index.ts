// Public API of the outlook engine. Browser-safe: nothing here imports Node, Nuxt or Vue.

export { EngineInputError, type EngineInputIssue } from './errors'
export {
  outlookInputSchema,
  DEFAULT_TOLERANCES,
  DEFAULT_RETURN_PERIODS,
  MAX_SAMPLES,
  THRESHOLD_KINDS,
  DEFAULT_DESIGN_LIFE_CHANCE,
  type OutlookInput,
  type ParsedOutlookInput,
  type ReleaseInput,
  type ComponentInput,
  type LandMotionInput,
  type ThresholdInput,
  type GumbelInput,
  type ObservationsInput,
} from './schema'
export { validateOutlookInput, expandHeightRange, type ValidatedOutlookInput } from './validate'
export { validateRelease, validateCorrelationMatrix, releaseIssues } from './release-validation'
export { releaseSchema, type ParsedRelease } from './schema'
export { planOutlook, BLOCK_SIZE } from './plan'
export { claimFromCounter, runBlocks, runClaimedBlocks, type NextBlock } from './run'
export { mergePartials } from './merge'
export { finishOutlook, PERCENTILE_LEVELS } from './finish'
export { carriedShare, recordReach, type RecordReach, type RecordReachMode } from './observation-reach'
export { runOutlook } from './outlook'
export { planTrajectories, sampleTrajectories, MAX_TRAJECTORIES, type Trajectories } from './trajectories'
export type {
  OutlookPlan,
  OutlookPartial,
  OutlookResult,
  YearOutlook,
  YearGumbel,
  ThresholdOutlook,
  ThresholdKind,
  FloodLevelOutlook,
  Estimate,
  PercentileEstimate,
  ObservationUpdate,
  UpdatedYear,
  UpdatedThreshold,
} from './types'
export { MIN_EFFECTIVE_SAMPLES } from './observation-finish'
export { LAND_MOTION_KEY } from './types'
export { meanLandRate } from './land-motion'
export {
  gumbelCdf,
  gumbelReturnLevel,
  gumbelFromMoments,
  fitGumbelByMoments,
  fitGumbelByLMoments,
  chanceOfAtLeastOne,
  type GumbelParameters,
} from './gumbel'
export { likelihoodWord, LIKELIHOOD_BANDS, type LikelihoodKey } from './likelihood'
export { gigatonnesToMetres, metresToGigatonnes, GIGATONNES_PER_MILLIMETRE } from './units'
export { standardNormalQuantile, standardNormalCdf } from './normal'
