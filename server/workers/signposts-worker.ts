import { parentPort, workerData } from 'node:worker_threads'
import { planTrajectories, sampleTrajectories } from '../../shared/engine/trajectories'
import {
  signposts,
  type SignpostDecision,
  type SignpostNoise,
} from '../../shared/observations/signposts'

// One decision's signposts (redrawing the outlook's trajectories, then the simulated gauge), on a
// thread of its own: the 0.2–0.6 s of CPU would otherwise hold up every other request meanwhile.

export interface SignpostsWork {
  /** The outlook's stored input: its trajectories are redrawn from it (same seed and blocks). */
  input: Record<string, unknown>
  trajectories: number
  decision: SignpostDecision
  years: number[]
  noise: SignpostNoise
  seed: number
}

const work = workerData as SignpostsWork
try {
  const trajectories = sampleTrajectories(planTrajectories(work.input), work.trajectories)
  parentPort!.postMessage({ signposts: signposts(trajectories, work.decision, work.years, work.noise, work.seed) })
}
catch (error) {
  parentPort!.postMessage({ error: error instanceof Error ? error.message : String(error) })
}
