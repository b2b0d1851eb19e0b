import type { APIRoute } from 'astro';
import { checkHealth } from '#lib/server/health.ts';
import { json } from '#lib/server/http/problem.ts';

/** Database, storage and mail: 200 only when all three are up. */
export const GET: APIRoute = async () => {
  const health = await checkHealth();
  return json(health, health.status === 'up' ? 200 : 503);
};
