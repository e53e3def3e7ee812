import { request as httpRequest } from 'node:http'

// A tiny API client with one cookie jar per signed-in person.
export interface ApiResponse<T = any> {
  status: number
  body: T
  headers: Headers
}

export class ApiClient {
  private cookies = new Map<string, string>()

  constructor(readonly baseUrl: string) {}

  async request<T = any>(
    method: string,
    path: string,
    body?: unknown,
    init: { rawBody?: string, headers?: Record<string, string>, signal?: AbortSignal } = {},
  ): Promise<ApiResponse<T>> {
    const headers: Record<string, string> = { accept: 'application/json', ...init.headers }
    if (this.cookies.size) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
    let payload: string | undefined = init.rawBody
    if (body !== undefined) {
      payload = JSON.stringify(body)
    }
    if (payload !== undefined) headers['content-type'] ??= 'application/json'
    const response = await fetch(this.baseUrl + path, {
      method,
      headers,
      body: payload,
      redirect: 'manual',
      signal: init.signal,
    })
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(';')
      const [name, ...value] = pair!.split('=')
      this.cookies.set(name!.trim(), value.join('='))
    }
    const text = await response.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : undefined
    }
    catch {
      /* not JSON: keep the text */
    }
    return { status: response.status, body: parsed as T, headers: response.headers }
  }

  /** The raw response (for binary bodies such as PDFs), with this client's cookies. */
  fetchRaw(path: string): Promise<Response> {
    return fetch(this.baseUrl + path, {
      headers: this.cookies.size ? { cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } : {},
    })
  }

  /** A request whose path goes out exactly as written: fetch would resolve `..` and `%2e%2e` first. */
  requestVerbatim<T = any>(method: string, path: string): Promise<ApiResponse<T>> {
    const { hostname, port } = new URL(this.baseUrl)
    const headers: Record<string, string> = { accept: 'application/json' }
    if (this.cookies.size) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
    return new Promise((resolve, reject) => {
      const outgoing = httpRequest({ host: hostname, port, method, path, headers }, (incoming) => {
        let text = ''
        incoming
          .setEncoding('utf8')
          .on('data', (chunk) => {
            text += chunk
          })
          .on('end', () => {
            let parsed: unknown = text
            try {
              parsed = text ? JSON.parse(text) : undefined
            }
            catch {
              /* not JSON: keep the text */
            }
            const responseHeaders = new Headers()
            for (const [name, value] of Object.entries(incoming.headers))
              if (typeof value === 'string') responseHeaders.set(name, value)
            resolve({ status: incoming.statusCode ?? 0, body: parsed as T, headers: responseHeaders })
          })
      })
      outgoing.on('error', reject).end()
    })
  }

  /** This client's cookies as a Cookie header (for tools that send their own requests). */
  cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }

  get<T = any>(path: string) {
    return this.request<T>('GET', path)
  }

  post<T = any>(path: string, body?: unknown) {
    return this.request<T>('POST', path, body)
  }

  patch<T = any>(path: string, body?: unknown) {
    return this.request<T>('PATCH', path, body)
  }

  put<T = any>(path: string, body?: unknown) {
    return this.request<T>('PUT', path, body)
  }

  /** A client for `baseUrl` already signed in as this person. */
  static async signedIn(baseUrl: string, email: string, password: string) {
    const api = new ApiClient(baseUrl)
    await api.signIn(email, password)
    return api
  }

  async signIn(email: string, password: string) {
    const response = await this.post('/api/auth/sign-in', { email, password })
    if (response.status !== 200)
      throw new Error(`Sign-in as ${email} failed: ${response.status} ${JSON.stringify(response.body)}`)
    return response.body.user
  }
}
