// drizzle-kit configuration: `npm run db:generate` writes SQL migrations from src/db/schema.ts into drizzle/.
import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  schema: './src/db/schema.ts',
  out: './drizzle',
  dialect: 'sqlite',
  dbCredentials: { url: process.env.DATABASE_URL ?? './data/seepline.db' },
});
