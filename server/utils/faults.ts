// Named points where the crash tests (tests/api/faults.test.ts) kill the server outright, to prove
// that what a transaction writes lands whole or not at all. Inert unless BRINKWATER_FAULT names
// the point; never set it outside those tests.

export type FaultPoint = 'outlook-write' | 'release-publish'

export function faultPoint(point: FaultPoint) {
  if (serverConfig().BRINKWATER_FAULT === point) process.kill(process.pid, 'SIGKILL')
}
