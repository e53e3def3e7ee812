import { z } from 'zod'

// zod compiles object parsers with `new Function` when it may, and probes for that once; under the
// app's content security policy (no 'unsafe-eval') the probe is blocked and reported as a violation.
// Parse without compiling in the browser. This runs at import time, before any schema is built.
z.config({ jitless: true })

export default defineNuxtPlugin(() => {})
