/**
 * The rules that classify and group raw frames, and the YAML file a user extends them with
 * (`whorl inventory --rules FILE`, format in RULES_FORMAT). Values are compared case-insensitively,
 * ignoring spaces, '-' and '_'.
 */
import { parseDocument } from 'yaml';
import { z } from 'zod';
import { InputError } from '../../errors.js';
import { formatKeyPath } from '../manifest/parse.js';
import type { InventoryFrameKind } from './types.js';

/** The rules file format, shown by `whorl inventory --help`. */
export const RULES_FORMAT = `  type_keywords: [IMAGETYP, OBSTYPE]    # keywords naming the kind of exposure
  types:                                # their values per kind (case, spaces, - and _ ignored)
    bias: [bias, zero]
    flat: [flat, domeflat, lampflat]
    arc: [arc, comp, lamp]
    science: [object, science]
  lamp_keywords: [LAMPS]                # keywords listing the lamps that were on
  arc_lamps: [Ne, Ar, He, Hg, Kr, Xe, Cd, Zn, Cu, Th, ThAr, CuAr, HeNeAr]
  flat_lamps: [quartz, halogen, tungsten, QTH]
  detector_keywords: [CCDSUM]           # with NAXIS1 x NAXIS2: which biases fit which frames
  setup_keywords: [GRATING, GRTILT]     # the spectral configuration that tells setups apart
  arc_block_minutes: 15                 # arcs closer in time than this form one block
  replace: false                        # true: the lists above replace the built-in ones
`;

export interface InventoryRules {
  typeKeywords: string[];
  /** Normalised keyword values per kind. */
  types: Record<Exclude<InventoryFrameKind, 'unknown'>, string[]>;
  lampKeywords: string[];
  arcLamps: string[];
  flatLamps: string[];
  detectorKeywords: string[];
  setupKeywords: string[];
  /** Arcs closer in time than this form one block (common practice: an arc sequence takes a few minutes). */
  arcBlockMinutes: number;
}

/** Lower case without spaces, '-' and '_': `Dome Flat` and `dome_flat` both become `domeflat`. */
export function normaliseValue(text: string): string {
  return text.toLowerCase().replace(/[\s_-]+/g, '');
}

export const DEFAULT_RULES: InventoryRules = {
  typeKeywords: ['IMAGETYP', 'OBSTYPE'],
  types: {
    bias: ['bias', 'zero'],
    flat: ['flat', 'domeflat', 'lampflat'],
    arc: ['arc', 'comp', 'lamp'],
    science: ['object', 'science'],
  },
  lampKeywords: ['LAMPS'],
  arcLamps: ['ne', 'ar', 'he', 'hg', 'kr', 'xe', 'cd', 'zn', 'cu', 'th', 'thar', 'cuar', 'henear'],
  flatLamps: ['quartz', 'halogen', 'tungsten', 'qth'],
  detectorKeywords: ['CCDSUM'],
  setupKeywords: ['GRATING', 'GRTILT'],
  arcBlockMinutes: 15,
};

const words = z.array(z.string().min(1));
const keywords = z.array(z.string().regex(/^[A-Za-z0-9_ -]{1,68}$/, 'a FITS keyword'));
const rulesFileSchema = z.strictObject({
  type_keywords: keywords.optional(),
  types: z.strictObject({ bias: words.optional(), flat: words.optional(), arc: words.optional(), science: words.optional() }).optional(),
  lamp_keywords: keywords.optional(),
  arc_lamps: words.optional(),
  flat_lamps: words.optional(),
  detector_keywords: keywords.optional(),
  setup_keywords: keywords.optional(),
  arc_block_minutes: z.number().positive().optional(),
  replace: z.boolean().optional(),
});

function merge(base: string[], extra: string[] | undefined, replace: boolean, norm: (s: string) => string): string[] {
  if (extra === undefined) return base;
  const added = extra.map(norm);
  return replace ? [...new Set(added)] : [...new Set([...base, ...added])];
}

/** Rules from the text of a rules file; InputError with key path and line for mistakes. */
export function parseRulesYaml(text: string, file: string): InventoryRules {
  const doc = parseDocument(text);
  if (doc.errors.length > 0) {
    const e = doc.errors[0]!;
    const pos = e.linePos?.[0];
    throw new InputError('inventory.rules-yaml', `not valid YAML: ${e.message.split('\n')[0]}`, pos ? { file, line: pos.line, column: pos.col } : { file });
  }
  const parsed = rulesFileSchema.safeParse(doc.toJS() ?? {});
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new InputError('inventory.rules-invalid', issue.message, { file, key: formatKeyPath(issue.path as (string | number)[]) }, { expected: 'the rules format of `whorl inventory --help`' });
  }
  const r = parsed.data;
  const replace = r.replace ?? false;
  const upper = (s: string) => s.trim().toUpperCase();
  return {
    typeKeywords: merge(DEFAULT_RULES.typeKeywords, r.type_keywords, replace, upper),
    types: {
      bias: merge(DEFAULT_RULES.types.bias, r.types?.bias, replace, normaliseValue),
      flat: merge(DEFAULT_RULES.types.flat, r.types?.flat, replace, normaliseValue),
      arc: merge(DEFAULT_RULES.types.arc, r.types?.arc, replace, normaliseValue),
      science: merge(DEFAULT_RULES.types.science, r.types?.science, replace, normaliseValue),
    },
    lampKeywords: merge(DEFAULT_RULES.lampKeywords, r.lamp_keywords, replace, upper),
    arcLamps: merge(DEFAULT_RULES.arcLamps, r.arc_lamps, replace, normaliseValue),
    flatLamps: merge(DEFAULT_RULES.flatLamps, r.flat_lamps, replace, normaliseValue),
    detectorKeywords: merge(DEFAULT_RULES.detectorKeywords, r.detector_keywords, replace, upper),
    setupKeywords: merge(DEFAULT_RULES.setupKeywords, r.setup_keywords, replace, upper),
    arcBlockMinutes: r.arc_block_minutes ?? DEFAULT_RULES.arcBlockMinutes,
  };
}
