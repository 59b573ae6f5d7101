/** Helpers for reading vega's SVG output in tests: the children of a named mark group, path vertices. */

/**
 * The markup (children only) of every mark group whose class list contains `<name>_marks` (vega names layer
 * marks so); a layer grouped by `detail` has one such group per series, in series order.
 */
export function markGroups(svg: string, name: string): string[] {
  const out: string[] = [];
  const re = new RegExp(`<g class="[^"]*\\b${name}_marks\\b[^"]*"`, 'g');
  for (let m = re.exec(svg); m !== null; m = re.exec(svg)) out.push(groupAt(svg, m.index, name));
  if (out.length === 0) throw new Error(`no mark group ${name}`);
  return out;
}

/** The first of {@link markGroups}. */
export function markGroup(svg: string, name: string): string {
  return markGroups(svg, name)[0];
}

function groupAt(svg: string, start: number, name: string): string {
  const open = svg.indexOf('>', start) + 1;
  let depth = 1;
  const re = /<(\/?)g\b[^>]*?(\/?)>/g;
  re.lastIndex = open;
  for (let m = re.exec(svg); m !== null; m = re.exec(svg)) {
    if (m[2] === '/') continue; // <g/>
    depth += m[1] === '/' ? -1 : 1;
    if (depth === 0) return svg.slice(open, m.index);
  }
  throw new Error(`unclosed mark group ${name}`);
}

/** The `<path>` elements directly in a mark group's markup (point, line and area marks are paths). */
export function paths(group: string): string[] {
  return [...group.matchAll(/<path\b[^>]*>/g)].map((m) => m[0]);
}

/** An attribute's value. */
export function attr(element: string, name: string): string | null {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(element);
  return m === null ? null : m[1];
}

/** The vertices of an M/L polyline path (`M1,2L3,4…`). */
export function vertices(d: string): [number, number][] {
  return [...d.matchAll(/[ML]\s*(-?[\d.]+(?:e-?\d+)?)[ ,](-?[\d.]+(?:e-?\d+)?)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}
