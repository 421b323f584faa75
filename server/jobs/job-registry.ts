import type { DataSource } from 'typeorm';

export interface JobContext {
  ds: DataSource;
  jobId: string;
  /** Stores how far the job got; readable at GET /api/jobs/:id while it runs. */
  progress(done: number, total: number | null): Promise<void>;
}

export type JobHandler = (data: Record<string, unknown>, ctx: JobContext) => Promise<unknown>;

export interface JobDefinition {
  name: string;
  handler: JobHandler;
  /** Attempts after the first failure (pg-boss retryLimit). */
  retryLimit?: number;
  /** Cron (UTC) for housekeeping jobs nobody asks for; pg-boss sends each tick once across processes. */
  schedule?: string;
}

const definitions = new Map<string, JobDefinition>();

/**
 * Features name their jobs here when the app is built (e.g. closure recompute, the daily digest);
 * the queue started by each server process works every defined job. Defining a name twice keeps
 * the last definition, so building the app twice in one process is harmless.
 */
export function defineJob(def: JobDefinition): void {
  if (!/^[a-z][a-z0-9-]*$/.test(def.name)) throw new Error(`job names are kebab-case: "${def.name}"`);
  definitions.set(def.name, def);
}

export function jobDefinitions(): JobDefinition[] {
  return [...definitions.values()];
}
