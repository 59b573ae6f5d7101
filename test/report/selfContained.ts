/** The self-containment check shared by the report tests and the browser test. */

/** Every way a page can reach outside itself; a self-contained report has none. */
export function externalReferences(page: string): string[] {
  const found: string[] = [];
  for (const m of page.matchAll(/https?:|\/\/[a-z0-9.-]+\.[a-z]{2,}\//gi)) found.push(m[0]);
  for (const m of page.matchAll(/\b(?:src|href|srcset|poster|data|action)\s*=\s*"([^"]*)"/gi)) {
    if (!(m[1].startsWith('data:') || m[1].startsWith('#'))) found.push(m[0]);
  }
  for (const m of page.matchAll(/url\(\s*['"]?([^)'"]*)/gi)) if (!m[1].startsWith('#') && !m[1].startsWith('data:')) found.push(m[0]);
  for (const m of page.matchAll(/<(script|link|iframe|object|embed|base)\b|@import/gi)) found.push(m[0]);
  return found;
}
