import type { InternalApi } from 'nitropack/types'

/**
 * What a server route answers, as the client receives it (dates as strings), inferred by Nitro from
 * the handler: props and composables name a response through this rather than copying its shape.
 */
export type ApiResponse<Route extends keyof InternalApi, Method extends string = 'get'>
  = Method extends keyof InternalApi[Route] ? InternalApi[Route][Method] : never
