import { describe, expect, it } from 'vitest';
import { SafeHtml, escapeHtml, html, htmlPage, trustedHtml } from '../../src/report/html.ts';

// Escaping rules: WHATWG "HTML Living Standard", §13.3 Serialising HTML fragments (& < > " replaced by references;
// ' as well, common practice, no source).
describe('escapeHtml', () => {
  it('turns a script tag into text', () => {
    expect(escapeHtml('<script>alert(1)</script>')).toBe('&lt;script&gt;alert(1)&lt;/script&gt;');
  });
  it('escapes & first-class and both quotes, keeps other text', () => {
    expect(escapeHtml(`a & b "c" 'd' é ≥`)).toBe('a &amp; b &quot;c&quot; &#39;d&#39; é ≥');
    expect(escapeHtml('&lt;')).toBe('&amp;lt;');
  });
});

describe('html template', () => {
  it('escapes every interpolated string and number, in text and in attributes', () => {
    const name = '"><img src=x onerror=alert(1)>';
    const out = html`<td title="${name}">${name}</td>`.value;
    expect(out).toBe('<td title="&quot;&gt;&lt;img src=x onerror=alert(1)&gt;">&quot;&gt;&lt;img src=x onerror=alert(1)&gt;</td>');
    expect(out).not.toContain('<img');
  });
  it('keeps SafeHtml, joins arrays, drops null, undefined and false', () => {
    const inner = html`<b>${'<i>'}</b>`;
    expect(inner).toBeInstanceOf(SafeHtml);
    expect(html`${[inner, 'x<', null, undefined, false, 3]}`.value).toBe('<b>&lt;i&gt;</b>x&lt;3');
    expect(html`${trustedHtml('<svg></svg>')}`.value).toBe('<svg></svg>');
  });
});

describe('htmlPage', () => {
  it('writes a UTF-8 document with a no-network policy, the CSS inline and the title escaped', () => {
    const page = htmlPage({ title: 'T<01>', css: 'body{color:red}', body: html`<p>${'hi'}</p>` });
    expect(page.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(page).toContain('<meta charset="utf-8">');
    expect(page).toContain("default-src &#39;none&#39;");
    expect(page).toContain('<title>T&lt;01&gt;</title>');
    expect(page).toContain('<style>body{color:red}</style>');
    expect(page).not.toMatch(/<script/i);
  });
});
