import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes SQL migrations into drizzle/; the server applies them at start.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
});
