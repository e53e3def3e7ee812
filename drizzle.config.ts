import { defineConfig } from 'drizzle-kit'

// drizzle-kit only diffs the schema into SQL files here; the app applies them itself at start.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './server/db/migrations',
})
