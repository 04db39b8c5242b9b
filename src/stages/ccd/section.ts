/** FITS image sections ('[x1:x2,y1:y2]', 1-based inclusive, as in BIASSEC/DATASEC) to 0-based end-exclusive. */
import { InputError, type ErrorPlace } from '../../errors.js';
import type { Section } from '../../products/frame.js';

const SECTION = /^\s*\[\s*(\d+)\s*:\s*(\d+)\s*,\s*(\d+)\s*:\s*(\d+)\s*\]\s*$/;

/** Parse a section and check it lies inside a width x height frame; `place` names where it came from. */
export function parseSection(text: string, width: number, height: number, place: ErrorPlace): Section {
  const m = SECTION.exec(text);
  if (!m) throw new InputError('ccd.section-syntax', `cannot read the section '${text}'`, place, { expected: "'[x1:x2,y1:y2]', 1-based inclusive" });
  const [x1, x2, y1, y2] = [m[1]!, m[2]!, m[3]!, m[4]!].map(Number) as [number, number, number, number];
  if (x1 < 1 || y1 < 1 || x2 < x1 || y2 < y1 || x2 > width || y2 > height) {
    throw new InputError('ccd.section-outside', `section '${text}' is not inside the ${width} x ${height} frame`, place, {
      expected: `1 <= x1 <= x2 <= ${width} and 1 <= y1 <= y2 <= ${height}`,
      actual: `[${x1}:${x2},${y1}:${y2}]`,
    });
  }
  return { x0: x1 - 1, x1: x2, y0: y1 - 1, y1: y2 };
}

/** The section back in the FITS 1-based inclusive notation. */
export function formatSection(s: Section): string {
  return `[${s.x0 + 1}:${s.x1},${s.y0 + 1}:${s.y1}]`;
}

export function sectionsOverlap(a: Section, b: Section): boolean {
  return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
}
