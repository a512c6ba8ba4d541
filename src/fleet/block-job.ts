import { WorkError } from '../errors.js';

/** The BullMQ queue every fit's blocks go through (jobs of different fits are told apart by their fit key). */
export const BLOCK_QUEUE = 'underfoot-blocks';

/**
 * What one job carries: the fit's key (hex digest), the digest of the fit's runs payload, the model
 * version, which pass (`call`) and block it is, and the block's run indices. Nothing else: the runs and
 * the model are read from Redis under the fit's key (`fleetKeys`), checked against these fields.
 */
export interface BlockJob {
  fit: string;
  runs: string;
  version: number;
  call: number;
  kind: 'counts' | 'score';
  block: number;
  members: number[];
}

/** The Redis keys of one fit (all under `underfoot:<fit>:`, so one fit's keys never meet another's). */
export function fleetKeys(fit: string): { runs: string; model: (version: number) => string; result: (call: number, block: number) => string } {
  const base = `underfoot:${fit}`;
  return {
    runs: `${base}:runs`,
    model: (version) => `${base}:model:${version}`,
    result: (call, block) => `${base}:result:${call}:${block}`,
  };
}

/** The BullMQ job id of a block (ids may not contain ':'). */
export function blockJobId(job: Pick<BlockJob, 'fit' | 'call' | 'block'>): string {
  return `${job.fit}-${job.call}-${job.block}`;
}

const HEX64 = /^[0-9a-f]{64}$/;
const MAX_MEMBERS = 1 << 16;

/**
 * A job's data, checked before anything is read for it: exactly the fields of `BlockJob`, digests as
 * 64 hex digits, whole numbers in range, and (when `fit` is given) the fit the caller serves. Throws a
 * one-line WorkError naming the job.
 */
export function checkBlockJob(data: unknown, where: string, fit?: string): BlockJob {
  const bad = (thing: string, requirement: string, got: unknown): never => {
    let text = JSON.stringify(got) ?? String(got);
    if (text.length > 80) text = `${text.slice(0, 77)}...`;
    throw new WorkError(`${where}: ${thing} must ${requirement}, got ${text}`);
  };
  if (typeof data !== 'object' || data === null || Array.isArray(data)) return bad('the job data', 'be an object', data);
  const d = data as Record<string, unknown>;
  const keys = ['fit', 'runs', 'version', 'call', 'kind', 'block', 'members'];
  const extra = Object.keys(d).filter((k) => !keys.includes(k));
  if (extra.length > 0) bad('the job data', `have only the keys ${keys.join(', ')}`, extra);
  if (typeof d.fit !== 'string' || !HEX64.test(d.fit)) bad('the fit key', 'be 64 hex digits', d.fit);
  if (fit !== undefined && d.fit !== fit) bad('the fit key', `be this fit's (${fit.slice(0, 12)}…)`, d.fit);
  if (typeof d.runs !== 'string' || !HEX64.test(d.runs)) bad('the runs digest', 'be 64 hex digits', d.runs);
  for (const k of ['version', 'call', 'block'] as const) {
    if (!Number.isSafeInteger(d[k]) || (d[k] as number) < 0) bad(k, 'be a whole number ≥ 0', d[k]);
  }
  if (d.kind !== 'counts' && d.kind !== 'score') bad('the kind', 'be counts or score', d.kind);
  const members = d.members;
  if (!Array.isArray(members) || members.length < 1 || members.length > MAX_MEMBERS) bad('the block', `list 1 to ${MAX_MEMBERS} runs`, members);
  for (const r of members as unknown[]) if (!Number.isSafeInteger(r) || (r as number) < 0) bad('every run index', 'be a whole number ≥ 0', r);
  return d as unknown as BlockJob;
}
