/** Tied groups of the requested lines, from the physics catalogue (src/physics). */
import { galaxyLine } from '../../physics/catalogues.js';
import { groupLines } from '../../physics/line-groups.js';
import type { GroupSpec } from './group-model.js';

/** The fit groups of the requested manifest names (unknown names are an InputError from the catalogue). */
export function groupSpecs(names: string[]): GroupSpec[] {
  return groupLines(names).map((g) => {
    const fluxIndex: number[] = [];
    const fluxFactor: number[] = [];
    let nFree = 0;
    const freeOf = new Map<string, number>();
    for (const name of g.members) {
      const ratio = g.ratios[name];
      if (ratio === undefined) {
        freeOf.set(name, nFree);
        fluxIndex.push(nFree++);
        fluxFactor.push(1);
      } else {
        // A fixed ratio refers to members[0], which always has a free flux.
        fluxIndex.push(freeOf.get(g.members[0]!)!);
        fluxFactor.push(ratio);
      }
    }
    return { name: g.name, members: g.members, rest: g.members.map((m) => galaxyLine(m).air), fluxIndex, fluxFactor, nFree };
  });
}
