import { Badge } from '@/components/ui/Page';

type State = 'queued' | 'running' | 'done' | 'failed';

const looks: Record<State, { label: string; tone: 'fringe' | 'film' | 'brass' | 'alarm' | 'plain' }> = {
  queued: { label: 'waiting', tone: 'plain' },
  running: { label: 'analysing', tone: 'brass' },
  done: { label: 'analysed', tone: 'film' },
  failed: { label: 'failed', tone: 'alarm' },
};

export function AnalysisStateBadge({ state }: { state: State | null }) {
  if (!state) return <Badge tone="plain">not analysed</Badge>;
  return <Badge tone={looks[state].tone}>{looks[state].label}</Badge>;
}
