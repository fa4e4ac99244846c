import type { CreateRunBody, RunCompareResponse, RunListResponse, RunResponse } from '../../shared/api/runs.js';
import { request } from './http';

const runsOf = (notebookId: string) => `/api/notebooks/${encodeURIComponent(notebookId)}/runs`;

/** Computes the notebook's current revision on the server with the given uploads in its slots. */
export function createRun(notebookId: string, body: CreateRunBody): Promise<RunResponse> {
  return request(runsOf(notebookId), { method: 'POST', body });
}

export function listRuns(notebookId: string): Promise<RunListResponse> {
  return request(runsOf(notebookId));
}

export function getRun(runId: string): Promise<RunResponse> {
  return request(`/api/runs/${encodeURIComponent(runId)}`);
}

/** One output (`cell.name`, `table.facts.offsetS` …) across every run, oldest first. */
export function compareRuns(notebookId: string, path: string): Promise<RunCompareResponse> {
  return request(`${runsOf(notebookId)}/compare`, { query: { path } });
}
