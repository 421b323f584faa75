/** What the toolbar says about sync, derived from the engine's facts (pure, so it is testable). */
export type SyncKind = 'upToDate' | 'unsynced' | 'pushing' | 'pulling' | 'offline' | 'signIn' | 'error';

export interface SyncFacts {
  pending: number;
  phase: 'idle' | 'pushing' | 'pulling';
  pushed: number;
  pushTotal: number;
  pulled: number;
  offline: boolean;
  needsSignIn: boolean;
  error: string | null;
}

export interface SyncView {
  kind: SyncKind;
  label: string;
  icon: string;
  /** 0–100 while pushing, null for an indeterminate bar while pulling, undefined when no bar. */
  progress?: number | null;
}

export function notYetSynced(n: number): string {
  return `${n} not yet synced`;
}

export function describeSync(f: SyncFacts): SyncView {
  const tail = f.pending > 0 ? ` · ${notYetSynced(f.pending)}` : '';
  if (f.needsSignIn) return { kind: 'signIn', label: `Sign in to sync${tail}`, icon: 'lock_clock' };
  if (f.phase === 'pushing') {
    const k = Math.min(f.pushed, f.pushTotal);
    return {
      kind: 'pushing',
      label: `Pushing ${k} of ${f.pushTotal}`,
      icon: 'cloud_upload',
      progress: f.pushTotal ? (100 * k) / f.pushTotal : 0,
    };
  }
  if (f.phase === 'pulling')
    return { kind: 'pulling', label: f.pulled ? `Pulling · ${f.pulled} records` : 'Pulling', icon: 'cloud_download', progress: null };
  if (f.offline) return { kind: 'offline', label: `Offline${tail}`, icon: 'cloud_off' };
  if (f.error) return { kind: 'error', label: `Sync error${tail}`, icon: 'sync_problem' };
  if (f.pending > 0) return { kind: 'unsynced', label: notYetSynced(f.pending), icon: 'cloud_sync' };
  return { kind: 'upToDate', label: 'Up to date', icon: 'cloud_done' };
}

/** Exponential back-off with jitter: 5 s, 10 s, 20 s … capped at 5 minutes. */
export function backoffMs(failures: number, random: () => number = Math.random): number {
  const base = Math.min(5 * 60_000, 5_000 * 2 ** Math.max(0, failures - 1));
  return Math.round(base * (0.75 + 0.5 * random()));
}
