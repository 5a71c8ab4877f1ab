import { fetchJson } from '@/components/query/fetchJson';

/** One analysis as GET /api/analyses/{id} answers it (shared/FORMATS.md). */
export type AnalysisState = { id: string; mode: 'sequential' | 'refit'; state: 'queued' | 'running' | 'done' | 'failed'; error?: string; result?: { layers: unknown[]; warnings: string[] } };

export const analysisFinished = (a?: AnalysisState) => a?.state === 'done' || a?.state === 'failed';

/** How often a queued or running analysis is asked after: the shop's workers take seconds, not minutes. */
export const ANALYSIS_POLL_MS = 1500;

/** The query that watches one analysis until it is done or failed, then stops asking. */
export function analysisQuery(id: string) {
  return {
    queryKey: ['analysis', id],
    queryFn: () => fetchJson<AnalysisState>(`/api/analyses/${id}`),
    refetchInterval: (q: { state: { data?: AnalysisState } }) => (analysisFinished(q.state.data) ? false : ANALYSIS_POLL_MS),
    staleTime: 0,
  };
}
