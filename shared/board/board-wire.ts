/*
 * What the Board's own routes answer (anomalies, devices, field members), written once: the server
 * builds these shapes and the Board reads them, so a renamed field is a compile error on both sides.
 */

export type AnomalyKind =
  | 'offset-moved'
  | 'offset-spread'
  | 'closure-flag'
  | 'settling'
  | 'not-visited'
  | 'check-problem'
  | 'calibration-overdue'
  | 'calibration-drift';

/** One thing on a site the lead should look at (GET /api/sites/:siteId/anomalies). */
export interface Anomaly {
  kind: AnomalyKind;
  /** `problem` needs action before data are used; `warn` is worth a look. */
  severity: 'problem' | 'warn';
  collarId: string | null;
  collarCode: string | null;
  /** The record the anomaly is about (offset set, closure, check, analyzer, collar). */
  recordId: string;
  at: string | null;
  value: number | null;
  threshold: number | null;
  message: string;
  /** For `closure-flag`: the QC flag codes behind the message (the message says them in words). */
  flags?: string[];
}

/** A device of a site's members and when it was last heard from (GET /api/sites/:siteId/devices). */
export interface DeviceRow {
  id: string;
  userId: string;
  email: string;
  displayName: string;
  lastPushAt: string | null;
  lastPullAt: string | null;
  /** Unsent operations the device reported with its last push. */
  outboxSize: number | null;
  /** Last time the device was heard from at all (push or pull). */
  lastSeenAt: string | null;
  silent: boolean;
}

/** A member a lead can assign to a route (GET /api/sites/:siteId/field-members). */
export interface MemberRow {
  id: string;
  displayName: string;
  email: string;
  roles: string[];
}

/** One route's state in the lead's end-of-day digest. */
export interface DigestRoute {
  routeId: string | null;
  routeName: string;
  /** Collar codes the progress query calls `due`, in walking order. */
  due: string[];
  /** Collars started but not finished, with what is still missing ("closures 1/2"). */
  partial: { code: string; missing: string[] }[];
  complete: number;
  skipped: number;
}

/** The lead's digest of one site, as mailed and as previewed on the Board (GET /api/sites/:siteId/digest). */
export interface Digest {
  site: { id: string; name: string; timezone: string };
  localDate: string;
  campaigns: { id: string; name: string; startsOn: string; endsOn: string; routes: DigestRoute[] }[];
  anomalies: { total: number; problems: number; items: Anomaly[] };
  silentDevices: { displayName: string; email: string; lastSeenAt: string | null; outboxSize: number | null }[];
}
