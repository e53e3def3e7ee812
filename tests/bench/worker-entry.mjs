// Worker threads do not inherit tsx's loader, so each one registers it before loading the TypeScript worker.
import { register } from 'tsx/esm/api'

register()
await import('./worker.ts')
