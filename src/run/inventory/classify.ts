/**
 * Classifying one raw frame from its header: the exposure-type keywords first (IMAGETYP/OBSTYPE
 * values), then the lamps that were on, then a zero exposure time for biases.
 */
import type { Header } from '../../fits/header.js';
import { normaliseValue, type InventoryRules } from './rules.js';
import type { ClassifiedFrame, FrameHeader, InventoryFrameKind } from './types.js';

/** A card value as text for grouping and messages (numbers as written by JS, strings trimmed). */
function text(header: Header, key: string): string | undefined {
  const v = header.get(key);
  if (v === undefined) return undefined;
  if (typeof v === 'object') return `${v.re},${v.im}`;
  return String(v).trim();
}

/** Start of exposure, ms since 1970 UTC: DATE-OBS (FITS 4.0 section 4.4.2.2, UTC unless TIMESYS says otherwise) joined with TIME-OBS or UT when it holds a date only. */
export function startMsOf(header: Header): number | undefined {
  const date = header.getString('DATE-OBS')?.trim();
  if (!date) return undefined;
  let stamp = date;
  if (/^\d{4}-\d\d-\d\d$/.test(date)) {
    const time = (header.getString('TIME-OBS') ?? header.getString('UT'))?.trim();
    stamp = time ? `${date}T${time}` : `${date}T00:00:00`;
  }
  const zoned = /(Z|[+-]\d\d:?\d\d)$/.test(stamp) ? stamp : `${stamp}Z`;
  const ms = Date.parse(zoned);
  return Number.isFinite(ms) ? ms : undefined;
}

function lampsOf(header: Header, rules: InventoryRules): string[] {
  const out: string[] = [];
  for (const key of rules.lampKeywords) {
    const v = text(header, key);
    if (v) for (const name of v.split(/[\s,;+/]+/)) if (name !== '') out.push(name);
  }
  return out;
}

function kindFromType(header: Header, rules: InventoryRules): { kind?: InventoryFrameKind; reason: string } {
  const seen: string[] = [];
  for (const key of rules.typeKeywords) {
    const v = text(header, key);
    if (v === undefined) continue;
    const norm = normaliseValue(v);
    for (const kind of ['bias', 'flat', 'arc', 'science'] as const) {
      if (rules.types[kind].includes(norm)) return { kind, reason: `${key} = '${v}'` };
    }
    seen.push(`${key} = '${v}'`);
  }
  return { reason: seen.length > 0 ? `${seen.join(', ')} is not a known exposure type` : `no ${rules.typeKeywords.join('/')} card` };
}

function keywordValues(header: Header, keys: string[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of keys) {
    const v = text(header, k);
    if (v !== undefined) out[k] = v;
  }
  return out;
}

export function classifyFrame(frame: FrameHeader, rules: InventoryRules): ClassifiedFrame {
  const h = frame.header;
  const lamps = lampsOf(h, rules);
  const arcLamp = lamps.some((l) => rules.arcLamps.includes(normaliseValue(l)));
  const flatLamp = lamps.some((l) => rules.flatLamps.includes(normaliseValue(l)));
  const lampText = `${rules.lampKeywords.find((k) => h.has(k)) ?? 'lamps'} = '${lamps.join(',')}'`;
  const exptimeS = h.getNumber('EXPTIME');
  const typed = kindFromType(h, rules);
  let kind: InventoryFrameKind = typed.kind ?? 'unknown';
  let reason = typed.reason;
  if ((kind === 'arc' && flatLamp && !arcLamp) || (kind === 'flat' && arcLamp && !flatLamp)) {
    // A lamp exposure whose lamps say which kind it is (`lamp` may mean either).
    kind = arcLamp ? 'arc' : 'flat';
    reason = `${typed.reason}, ${lampText}`;
  } else if (kind === 'unknown' && (arcLamp || flatLamp) && arcLamp !== flatLamp) {
    kind = arcLamp ? 'arc' : 'flat';
    reason = `${lampText} (${typed.reason})`;
  } else if (kind === 'unknown' && exptimeS === 0) {
    kind = 'bias';
    reason = `EXPTIME = 0 (${typed.reason})`;
  }
  const out: ClassifiedFrame = {
    ...frame,
    kind,
    reason,
    width: h.getNumber('NAXIS1') ?? 0,
    height: h.getNumber('NAXIS2') ?? 0,
    detector: keywordValues(h, rules.detectorKeywords),
    spectral: keywordValues(h, rules.setupKeywords),
    lamps,
  };
  const object = text(h, 'OBJECT');
  if (object) out.object = object;
  const startMs = startMsOf(h);
  if (startMs !== undefined) out.startMs = startMs;
  if (exptimeS !== undefined) out.exptimeS = exptimeS;
  return out;
}
