// The small part of autocannon's API the load test uses (the package ships no types).
declare module 'autocannon' {
  namespace autocannon {
    interface Options { url: string, connections?: number, duration?: number, headers?: Record<string, string> }
    interface Histogram { average: number, total: number, p50: number, p90: number, p99: number, max: number }
    interface Result { latency: Histogram, requests: Histogram, errors: number, timeouts: number, non2xx: number }
  }
  function autocannon(
    options: autocannon.Options,
    done: (error: Error | null, result: autocannon.Result) => void,
  ): import('node:events').EventEmitter
  export default autocannon
}
